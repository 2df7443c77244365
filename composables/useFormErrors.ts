import type { FetchError } from 'ofetch'
import type { ZodType } from 'zod'
import { fieldMessages, summariseFields } from '#shared/schemas/field-messages'

interface ApiErrorData {
  message?: string
  data?: { fields?: Record<string, string> }
}

/** Turns an API error into a message for the form and messages per field (from the shared zod schema). */
export function useFormErrors() {
  const message = ref('')
  const fields = ref<Record<string, string>>({})

  function clear() {
    message.value = ''
    fields.value = {}
  }

  function take(error: unknown) {
    const data = (error as FetchError<ApiErrorData>).data
    message.value = data?.message || (error as Error).message || 'Something went wrong. Please try again.'
    fields.value = data?.data?.fields ?? {}
  }

  /** Checks `value` with the route's own zod schema before sending, so the form says what the server would. */
  function check(schema: ZodType, value: unknown): boolean {
    const result = schema.safeParse(value)
    if (result.success) return true
    fields.value = fieldMessages(result.error)
    message.value = summariseFields(fields.value)
    return false
  }

  return { message, fields, clear, take, check }
}
