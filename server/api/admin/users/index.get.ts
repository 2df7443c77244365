import { listUsers } from '../../../services/accounts'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'admin')
  return listUsers(useDb())
})
