import { idParamSchema } from '#shared/schemas/auth'
import { endOutage } from '../../../services/cutter-outages'

// The cutter is back in service: its time can be booked again from now.
export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  return endOutage(useDb(), staff, id)
})
