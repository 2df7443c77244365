// Decodes Stripe's form encoding — `a[b][c]=1`, `items[0][name]=x`, `expand[]=y` — into nested
// objects and arrays, the inverse of how the official SDKs encode request parameters.
export type FormValue = string | FormValue[] | { [key: string]: FormValue }
export type FormObject = { [key: string]: FormValue }

const FORBIDDEN_KEYS = new Set(['__proto__', 'prototype', 'constructor'])

export class MalformedFormKey extends Error {
  constructor(readonly key: string) {
    super(`Invalid parameter name: ${key}`)
  }
}

/** Splits `line_items[0][price_data][currency]` into ['line_items', '0', 'price_data', 'currency']; `[]` becomes ''. */
function keyPath(key: string): string[] {
  const match = /^([^[\]]+)((?:\[[^[\]]*\])*)$/.exec(key)
  if (!match) throw new MalformedFormKey(key)
  const path = [match[1]!, ...[...match[2]!.matchAll(/\[([^[\]]*)\]/g)].map((m) => m[1]!)]
  if (path.some((segment) => FORBIDDEN_KEYS.has(segment))) throw new MalformedFormKey(key)
  return path
}

/** Objects whose keys are all array indices (or `[]` pushes) become arrays, ordered by index. */
function arraysFromIndexedObjects(value: FormValue): FormValue {
  if (typeof value === 'string' || Array.isArray(value)) return value
  const entries = Object.entries(value).map(([key, child]) => [key, arraysFromIndexedObjects(child)] as const)
  const indexed = entries.length > 0 && entries.every(([key]) => /^\d+$/.test(key) || key.startsWith('[]'))
  if (!indexed) return Object.fromEntries(entries)
  return entries
    .map(([key, child], order) => ({ index: key.startsWith('[]') ? Number.MAX_SAFE_INTEGER : Number(key), order, child }))
    .sort((a, b) => a.index - b.index || a.order - b.order)
    .map((entry) => entry.child)
}

export function decodeStripeForm(body: string): FormObject {
  const root: { [key: string]: FormValue } = {}
  let pushCount = 0
  for (const [rawKey, value] of new URLSearchParams(body)) {
    const path = keyPath(rawKey)
    let node = root
    path.forEach((segment, depth) => {
      // Each `[]` push gets its own slot so repeated `expand[]=a&expand[]=b` keeps both values.
      const key = segment === '' ? `[]${pushCount++}` : segment
      if (depth === path.length - 1) {
        node[key] = value
        return
      }
      const child = node[key]
      if (child === undefined || typeof child === 'string') node[key] = {}
      node = node[key] as { [key: string]: FormValue }
    })
  }
  return Object.fromEntries(Object.entries(root).map(([key, value]) => [key, arraysFromIndexedObjects(value)]))
}
