import { adminHome } from '../../services/home'

// The admin's overview: the staff's, plus this week's revenue and utilisation per cutter.
export default defineApiHandler(async (event) => {
  await requireRole(event, 'admin')
  return adminHome(useDb())
})
