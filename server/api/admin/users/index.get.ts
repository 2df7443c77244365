import { pageQuerySchema } from '#shared/schemas/paging'
import { listUsers } from '../../../services/accounts'
import { listUsersPage } from '../../../services/member-list'

// Every account by name; in pages with `limit`.
export default defineApiHandler(async (event) => {
  await requireRole(event, 'admin')
  const { limit, cursor } = readQueryAs(event, pageQuerySchema)
  return limit ? listUsersPage(useDb(), {}, { limit, cursor }) : listUsers(useDb())
})
