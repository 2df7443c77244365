import { listUsers } from '../../services/accounts'

// Staff need the member list for sign-offs and review; admins see the same.
export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  return listUsers(useDb(), { role: 'member' })
})
