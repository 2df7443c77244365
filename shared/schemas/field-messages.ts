import type { ZodError } from 'zod'

/** One message per field (dotted path), the first zod gave; the form and the server both use it. */
export function fieldMessages(error: ZodError): Record<string, string> {
  const fields: Record<string, string> = {}
  for (const issue of error.issues) {
    const key = issue.path.join('.') || '_'
    fields[key] ??= issue.message
  }
  return fields
}

export function summariseFields(fields: Record<string, string>): string {
  return `Please check the form: ${Object.entries(fields)
    .map(([field, message]) => (field === '_' ? message : `${field}: ${message}`))
    .join('; ')}`
}
