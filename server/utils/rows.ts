// Database rows use snake_case; the API uses camelCase. These convert one record either way.
const toCamelKey = (key: string) => key.replace(/_([a-z0-9])/g, (_, c: string) => c.toUpperCase())
const toSnakeKey = (key: string) => key.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`)

export function camelRow<T>(row: Record<string, unknown>): T {
  return Object.fromEntries(Object.entries(row).map(([k, v]) => [toCamelKey(k), v])) as T
}

export function snakeRow(record: Record<string, unknown>): Record<string, unknown> {
  return Object.fromEntries(
    Object.entries(record)
      .filter(([, v]) => v !== undefined)
      .map(([k, v]) => [toSnakeKey(k), v]),
  )
}

export const nowIso = () => new Date().toISOString()
