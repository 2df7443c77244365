import { staffHome } from '../../services/home'

// The staff's overview: the review queue, today's bookings per cutter, parts on the shelf, cutters out of service.
export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  return staffHome(useDb())
})
