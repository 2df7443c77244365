import { z } from 'zod'

// Lists that grow with time come in pages: `limit` asks for pages (and sets their size); `cursor` is the
// `nextCursor` of the page before. Without `limit` a list route answers with the whole list, as before.
export const MAX_PAGE_SIZE = 200

export const pageQuerySchema = z.object({
  limit: z.coerce.number({ error: 'The page size must be a number.' }).int().min(1).max(MAX_PAGE_SIZE, { error: `At most ${MAX_PAGE_SIZE} rows a page.` }).optional(),
  cursor: z.string().max(500).regex(/^[A-Za-z0-9_-]+$/, { error: 'This page link is damaged; start from the first page.' }).optional(),
})
export type PageQuery = z.output<typeof pageQuerySchema>

/** One page of a list; `nextCursor` is null on the last page. */
export interface Page<Item> {
  items: Item[]
  nextCursor: string | null
}
