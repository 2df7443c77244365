import type { FetchError } from 'ofetch'

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

  return { message, fields, clear, take }
}
