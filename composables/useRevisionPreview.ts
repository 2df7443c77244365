import type { FindingCounts, FindingGroup, FindingSites } from '#shared/finding-groups'
import { PackedFormatError, decodeGeometry, decodeSites, type PreviewGeometry } from '#shared/packed-analysis'
import { fetchBytes } from '~/utils/preview/packed-fetch'

/** A revision's summary as its route answers it: no sites, no geometry. */
export interface RevisionSummary {
  revision: number
  originalName: string
  bbox: { x: number; y: number; width: number; height: number }
  findingGroups: FindingGroup[]
  counts: FindingCounts
}

export interface RevisionPreview {
  summary: RevisionSummary
  geometry: PreviewGeometry
  sites: FindingSites
}

/**
 * Fetches a revision's summary, packed geometry and packed sites in the browser only (never into the
 * server-rendered payload), with how many of the three have arrived and the first failure. The decoded
 * typed arrays are kept out of Vue's reactivity.
 */
export function useRevisionPreview(url: () => string) {
  const preview = shallowRef<RevisionPreview | null>(null)
  const arrived = ref(0)
  const failure = ref<string | null>(null)
  let controller: AbortController | null = null

  async function load() {
    controller?.abort()
    const current = new AbortController()
    controller = current
    preview.value = null
    failure.value = null
    arrived.value = 0
    const base = url()
    const counted = <T>(promise: Promise<T>) => promise.then((value) => (arrived.value++, value))
    try {
      const [summary, geometryBytes, sitesBytes] = await Promise.all([
        counted($fetch<RevisionSummary>(base, { signal: current.signal })),
        counted(fetchBytes(`${base}/geometry`, current.signal)),
        counted(fetchBytes(`${base}/sites`, current.signal)),
      ])
      if (current.signal.aborted) return
      preview.value = markRaw({ summary, geometry: markRaw(decodeGeometry(geometryBytes)), sites: markRaw(decodeSites(sitesBytes)) })
    } catch (error) {
      if (current.signal.aborted) return
      // $fetch errors carry the server's sentence in data.message; a damaged download says so plainly.
      const fromServer = (error as { data?: { message?: string } }).data?.message
      failure.value = fromServer ?? (error instanceof PackedFormatError ? 'The stored preview of this revision is damaged; upload the file again.' : error instanceof Error ? error.message : String(error))
    }
  }

  onMounted(load)
  watch(url, load)
  onBeforeUnmount(() => controller?.abort())
  return { preview, arrived, failure, reload: load }
}
