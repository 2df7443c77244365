import { pageQuerySchema } from '#shared/schemas/paging'
import { listUsers } from '../../services/accounts'
import { listUsersPage } from '../../services/member-list'

// Staff need the member list for sign-offs and review; admins see the same. In pages with `limit`.
export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { limit, cursor } = readQueryAs(event, pageQuerySchema)
  return limit ? listUsersPage(useDb(), { role: 'member' }, { limit, cursor }) : listUsers(useDb(), { role: 'member' })
})
