import { outageCreateSchema } from '#shared/schemas/outages'
import { markCutterDown } from '../../services/cutter-outages'

// A cutter goes out of service: the members booked on it in the period are told at once and their holds released.
export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const input = await readBodyAs(event, outageCreateSchema)
  setResponseStatus(event, 201)
  return markCutterDown(useDb(), staff, input)
})
