import type { Knex } from 'knex'
import type { Page, PageQuery } from '#shared/schemas/paging'
import { InvalidInput } from './errors'

/**
 * The sort of a paged list: SQL expressions ending with a unique one (the id), all in one direction. Keyset
 * paging continues after the last row's values, so a row added or removed meanwhile never shifts the rows of
 * later pages: none is shown twice and none that was there is skipped.
 */
export interface PageOrder<Row> {
  columns: string[]
  direction: 'asc' | 'desc'
  /** The last row's values of `columns`, in order. */
  keyOf: (row: Row) => (string | number | null)[]
}

const encode = (values: unknown[]) => Buffer.from(JSON.stringify(values)).toString('base64url')

function decode(cursor: string, length: number): (string | number)[] {
  try {
    const values = JSON.parse(Buffer.from(cursor, 'base64url').toString('utf8'))
    if (Array.isArray(values) && values.length === length && values.every((v) => typeof v === 'string' || typeof v === 'number')) return values
  } catch {
    // falls through to the refusal below
  }
  throw new InvalidInput('This page link is damaged; start from the first page.')
}

/**
 * Orders the query, continues after the cursor and reads one row more than the page holds, to know whether
 * another page follows. A row value comparison `(a, id) > (?, ?)` (SQLite and PostgreSQL) walks an index on the columns.
 */
export async function keysetPage<Row>(query: Knex.QueryBuilder, order: PageOrder<Row>, page: Required<Pick<PageQuery, 'limit'>> & Pick<PageQuery, 'cursor'>): Promise<Page<Row>> {
  const { columns, direction } = order
  if (page.cursor) {
    const values = decode(page.cursor, columns.length)
    query.whereRaw(`(${columns.join(', ')}) ${direction === 'asc' ? '>' : '<'} (${columns.map(() => '?').join(', ')})`, values)
  }
  for (const column of columns) query.orderByRaw(`${column} ${direction}`)
  const rows: Row[] = await query.limit(page.limit + 1)
  const items = rows.slice(0, page.limit)
  return { items, nextCursor: rows.length > page.limit ? encode(order.keyOf(items.at(-1)!)) : null }
}

/** A page's rows turned into what the route answers with. */
export async function mapPage<Row, Item>(page: Page<Row>, map: (rows: Row[]) => Item[] | Promise<Item[]>): Promise<Page<Item>> {
  return { items: await map(page.items), nextCursor: page.nextCursor }
}
