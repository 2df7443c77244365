import type { Knex } from 'knex'
import type { Role } from '#shared/roles'
import type { Page, PageQuery } from '#shared/schemas/paging'
import { keysetPage, mapPage } from '../utils/paging'
import { toListItem, type UserListItem, type UserRow } from './accounts'

/** Accounts by name, a page at a time (the staff's members list, the admin's accounts). */
export async function listUsersPage(db: Knex, filter: { role?: Role }, page: Required<Pick<PageQuery, 'limit'>> & Pick<PageQuery, 'cursor'>): Promise<Page<UserListItem>> {
  const query = db<UserRow>('users').select('*')
  if (filter.role) query.where({ role: filter.role })
  const order = { columns: ['name', 'id'], direction: 'asc' as const, keyOf: (row: UserRow) => [row.name, row.id] }
  return mapPage(await keysetPage<UserRow>(query, order, page), (rows) => rows.map(toListItem))
}
