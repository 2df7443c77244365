import { z } from 'zod'
import { invalidParam } from './errors'
import type { FormObject } from './form-body'

/** Stripe's bracket notation for a parameter path: line_items[0][price_data][currency]. */
function paramName(path: PropertyKey[]): string {
  return path.map((segment, index) => (index === 0 ? String(segment) : `[${String(segment)}]`)).join('')
}

/**
 * Validates decoded form parameters and turns the first problem into the error Stripe gives for it:
 * "Missing required param", "Received unknown parameter", or an invalid value, each naming `param`.
 */
export function parseParams<Schema extends z.ZodType>(schema: Schema, params: FormObject): z.output<Schema> {
  const result = schema.safeParse(params, { reportInput: true })
  if (result.success) return result.data
  const issue = result.error.issues[0]!
  if (issue.code === 'unrecognized_keys') {
    throw invalidParam(`Received unknown parameter: ${paramName([...issue.path, issue.keys[0]!])}`, paramName([...issue.path, issue.keys[0]!]), 'parameter_unknown')
  }
  const param = paramName(issue.path)
  if (issue.code === 'invalid_type' && issue.input === undefined) {
    throw invalidParam(`Missing required param: ${param}.`, param, 'parameter_missing')
  }
  const shownInput = typeof issue.input === 'string' ? `: ${issue.input}` : ''
  throw invalidParam(`${issue.message} (${param})${shownInput}`, param)
}

/** Form values arrive as strings; Stripe rejects anything but a plain integer with "Invalid integer". */
export const formInteger = z
  .string()
  .regex(/^-?\d+$/, { error: 'Invalid integer' })
  .transform(Number)
  .pipe(z.number().int().min(0, { error: 'Must be a non-negative integer' }))

export const formPositiveInteger = formInteger.pipe(z.number().min(1, { error: 'Must be at least 1' }))

// Stripe's metadata limits: 50 keys, key names up to 40 characters, values up to 500 (API reference, "Metadata").
const metadataRecord = z
  .record(z.string().max(40), z.string().max(500))
  .refine((record) => Object.keys(record).length <= 50, { error: 'Metadata can have up to 50 keys' })

/** Posting an empty `metadata=` means "no metadata" in Stripe's form encoding. */
export const metadataParam = z.union([z.literal('').transform(() => ({})), metadataRecord]).optional()

export const expandParam = z.array(z.string()).optional()

/** For endpoints whose only parameter is `expand[]`. */
export const expandOnlyParams = z.strictObject({ expand: expandParam })

export const currencyParam = z
  .string()
  .regex(/^[a-zA-Z]{3}$/, { error: 'Invalid currency, expected a three-letter ISO 4217 code' })
  .transform((code) => code.toLowerCase())

/** `limit` and `starting_after` of Stripe's list endpoints (API reference, "Pagination"). */
export const paginationParams = {
  limit: formPositiveInteger.pipe(z.number().max(100, { error: 'Must be at most 100' })).optional(),
  starting_after: z.string().optional(),
  expand: expandParam,
}
