import { blockCreateSchema } from '#shared/schemas/bookings'
import { blockTime } from '../../services/bookings'

// Staff keep time free for maintenance, training or their own work.
export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  setResponseStatus(event, 201)
  return blockTime(useDb(), staff, await readBodyAs(event, blockCreateSchema))
})
