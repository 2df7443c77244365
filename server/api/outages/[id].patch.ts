import { idParamSchema } from '#shared/schemas/auth'
import { outageChangeSchema } from '#shared/schemas/outages'
import { changeOutage } from '../../services/cutter-outages'

// A new reason or expected return; a longer period calls off the bookings it now covers.
export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  return changeOutage(useDb(), staff, id, await readBodyAs(event, outageChangeSchema))
})
