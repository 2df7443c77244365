/**
 * The subset of CSS that drawing programs put in an SVG <style>: rules whose
 * selectors are a single class, id or element name. Anything fancier is
 * skipped rather than half-applied.
 */
export class StyleSheet {
  private readonly byClass = new Map<string, Array<[string, string]>>()
  private readonly byId = new Map<string, Array<[string, string]>>()
  private readonly byElement = new Map<string, Array<[string, string]>>()

  add(cssText: string): void {
    const withoutComments = cssText.replace(/\/\*[\s\S]*?\*\//g, '')
    for (const rule of withoutComments.matchAll(/([^{}@]+)\{([^{}]*)\}/g)) {
      const declarations = parseDeclarations(rule[2]!)
      for (const selector of rule[1]!.split(',').map((part) => part.trim())) {
        if (/^\.[\w-]+$/.test(selector)) appendTo(this.byClass, selector.slice(1), declarations)
        else if (/^#[\w-]+$/.test(selector)) appendTo(this.byId, selector.slice(1), declarations)
        else if (/^[a-zA-Z][\w-]*$/.test(selector)) appendTo(this.byElement, selector, declarations)
      }
    }
  }

  get isEmpty(): boolean {
    return this.byClass.size + this.byId.size + this.byElement.size === 0
  }

  /** Matching declarations in CSS specificity order (element, class, id). */
  matching(elementName: string, classAttribute: string | undefined, id: string | undefined): ReadonlyArray<[string, string]> {
    // Most sheets hold one kind of selector: lookups into an empty map are skipped, since hashing an id or class costs more than the rest.
    const byElement = this.byElement.size > 0 ? this.byElement.get(elementName) : undefined
    let found: Array<[string, string]> | undefined = byElement && [...byElement]
    if (classAttribute && this.byClass.size > 0) {
      for (const className of classAttribute.split(/\s+/)) {
        const declarations = this.byClass.get(className)
        if (declarations) (found ??= []).push(...declarations)
      }
    }
    if (id && this.byId.size > 0) {
      const declarations = this.byId.get(id)
      if (declarations) (found ??= []).push(...declarations)
    }
    return found ?? NO_DECLARATIONS
  }
}

const NO_DECLARATIONS: ReadonlyArray<[string, string]> = Object.freeze([])

export function parseDeclarations(text: string): Array<[string, string]> {
  const declarations: Array<[string, string]> = []
  for (const declaration of text.split(';')) {
    const colon = declaration.indexOf(':')
    if (colon < 0) continue
    const property = declaration.slice(0, colon).trim().toLowerCase()
    const value = declaration.slice(colon + 1).replace(/!important/i, '').trim()
    if (property && value) declarations.push([property, value])
  }
  return declarations
}

function appendTo(map: Map<string, Array<[string, string]>>, key: string, declarations: Array<[string, string]>): void {
  const existing = map.get(key)
  if (existing) existing.push(...declarations)
  else map.set(key, [...declarations])
}
