import type { Page } from '#shared/schemas/paging'

/**
 * A list that comes in pages (`limit` + `cursor`): the first page is fetched with useFetch (so it renders on the
 * server and refetches when the query changes), further pages are appended by `loadMore`. The server pages by
 * keyset, so a row written meanwhile never repeats or pushes another out.
 */
export async function usePagedList<Item, Extra extends object = object>(
  url: string,
  options: { query?: MaybeRefOrGetter<Record<string, string | number | undefined>>; pageSize?: number } = {},
) {
  const query = computed(() => ({ ...toValue(options.query), limit: options.pageSize ?? 50 }))
  const first = await useFetch<Page<Item> & Partial<Extra>>(url, { query })
  // useFetch's `pick` typing can't resolve over a type parameter; without `pick` the data is the page itself.
  const firstPage = first.data as Ref<(Page<Item> & Partial<Extra>) | undefined>
  const more = ref<Item[]>([]) as Ref<Item[]>
  const cursor = ref<string | null>(null)
  watch(firstPage, (page) => {
    more.value = []
    cursor.value = page?.nextCursor ?? null
  }, { immediate: true })
  const loadingMore = ref(false)
  const moreError = ref('')

  async function loadMore() {
    if (!cursor.value || loadingMore.value) return
    loadingMore.value = true
    moreError.value = ''
    try {
      const page = await $fetch<Page<Item>>(url, { query: { ...query.value, cursor: cursor.value } })
      more.value = [...more.value, ...page.items]
      cursor.value = page.nextCursor
    } catch (error) {
      moreError.value = (error as { data?: { message?: string } }).data?.message ?? 'The next page could not be loaded. Try again.'
    } finally {
      loadingMore.value = false
    }
  }

  return {
    items: computed(() => [...(firstPage.value?.items ?? []), ...more.value]),
    /** The first page's answer, for what a route adds beside the rows (totals). */
    firstPage,
    status: first.status,
    error: first.error,
    refresh: first.refresh,
    hasMore: computed(() => cursor.value !== null),
    loadingMore,
    moreError,
    loadMore,
  }
}
