import { invalidParam } from './errors'

/**
 * Replaces the ids named in `expand[]` with the objects they point to (API reference, "Expanding responses").
 * Only the fields listed in `expanders` can be expanded; nested paths (a.b) are not supported by the fake.
 */
export function expandFields<Shape extends object>(
  object: Shape,
  requested: string[] | undefined,
  expanders: Partial<Record<keyof Shape & string, (object: Shape) => unknown>>,
): Shape {
  const expanded: Record<string, unknown> = { ...(object as Record<string, unknown>) }
  for (const field of requested ?? []) {
    const expander = expanders[field as keyof Shape & string]
    if (!expander) throw invalidParam(`This property cannot be expanded (${field}).`, 'expand')
    expanded[field] = expander(object)
  }
  return expanded as Shape
}
