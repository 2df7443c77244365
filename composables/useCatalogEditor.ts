import type { Ref } from 'vue'
import type { ZodType } from 'zod'

/** A form over a row: any of its fields, empty (null) until filled in. A page whose form differs names its own. */
export type RowDraft<Row> = { [Key in keyof Row]?: Row[Key] | null }

// The create / edit / remove cycle every catalog page shares: one draft at a time, server errors per field,
// a confirmation before removal, and a refresh of the list after each change.
export function useCatalogEditor<Row extends { id: number }, Draft extends object = RowDraft<Row>>(options: {
  listUrl: string | (() => string)
  itemUrl: string
  blank: () => Draft
  /** What of a row goes into the edit form. */
  toDraft?: (row: Row) => Draft
  /** The route's zod schemas (shared/schemas), checked before anything is sent. */
  createSchema?: ZodType
  updateSchema?: ZodType
}) {
  const list = useFetch<Row[]>(options.listUrl, { default: () => [] as Row[] })
  // Deeply reactive like any ref (the form writes into it); typed as the page's draft.
  const draft = ref(null) as Ref<Draft | null>
  const editingId = ref<number | null>(null)
  const saving = ref(false)
  const notice = ref('')
  const pendingRemoval = ref<Row | null>(null)
  const errors = useFormErrors()

  function startNew() {
    errors.clear()
    editingId.value = null
    draft.value = options.blank()
  }

  function startEdit(row: Row) {
    errors.clear()
    editingId.value = row.id
    // Without toDraft a page edits the row's own fields (its Draft is RowDraft<Row>).
    draft.value = options.toDraft ? options.toDraft(row) : ({ ...row } as object as Draft)
  }

  function cancel() {
    draft.value = null
    editingId.value = null
    errors.clear()
  }

  async function save(body: object = draft.value ?? {}) {
    errors.clear()
    const schema = editingId.value === null ? options.createSchema : options.updateSchema
    if (schema && !errors.check(schema, body)) return
    saving.value = true
    try {
      if (editingId.value === null) await $fetch(options.itemUrl, { method: 'POST', body })
      else await $fetch(`${options.itemUrl}/${editingId.value}`, { method: 'PATCH', body })
      notice.value = editingId.value === null ? 'Added.' : 'Saved.'
      cancel()
      await list.refresh()
    } catch (error) {
      errors.take(error)
    } finally {
      saving.value = false
    }
  }

  /** Asks before removing `row`; `cancelRemoval` drops the question. */
  function askRemoval(row: Row) {
    pendingRemoval.value = row
  }

  function cancelRemoval() {
    pendingRemoval.value = null
  }

  async function remove() {
    const row = pendingRemoval.value
    if (!row) return
    saving.value = true
    errors.clear()
    try {
      const result = await $fetch<{ archived?: boolean } | null>(`${options.itemUrl}/${row.id}`, { method: 'DELETE' })
      notice.value = result?.archived ? 'Archived: it is kept for the jobs that used it.' : 'Removed.'
      await list.refresh()
    } catch (error) {
      errors.take(error)
    } finally {
      saving.value = false
      pendingRemoval.value = null
    }
  }

  return {
    list, rows: list.data, draft, editingId, saving, notice, errors, pendingRemoval,
    startNew, startEdit, cancel, save, askRemoval, cancelRemoval, remove,
  }
}
