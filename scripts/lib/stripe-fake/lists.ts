import { invalidParam } from './errors'
import type { FakeList } from './objects'

/**
 * Stripe's cursor pagination (API reference, "Pagination"): `limit` 1–100, default 10, and
 * `starting_after` an id in the list, giving the items that follow it in list order.
 */
export function paginate<Item extends { id: string }>(items: Item[], url: string, limit = 10, startingAfter?: string): FakeList<Item> {
  let start = 0
  if (startingAfter !== undefined) {
    const cursorIndex = items.findIndex((item) => item.id === startingAfter)
    if (cursorIndex === -1) throw invalidParam(`No such object: '${startingAfter}'`, 'starting_after', 'resource_missing')
    start = cursorIndex + 1
  }
  const page = items.slice(start, start + limit)
  return { object: 'list', data: page, has_more: start + limit < items.length, url }
}
