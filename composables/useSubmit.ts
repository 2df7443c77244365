// The submit cycle every form shares: busy while the request runs, server errors for the form and its fields.
export function useSubmit() {
  const busy = ref(false)
  const errors = useFormErrors()

  /** Runs `work`; a failure ends up in `errors` and resolves to undefined. */
  async function run<T>(work: () => Promise<T>): Promise<T | undefined> {
    busy.value = true
    errors.clear()
    try {
      return await work()
    } catch (error) {
      errors.take(error)
      return undefined
    } finally {
      busy.value = false
    }
  }

  return { busy, errors, run }
}
