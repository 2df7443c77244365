import { idParamSchema } from '#shared/schemas/auth'
import { revokeSignOff } from '../../../services/catalog/sign-offs'

export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  return revokeSignOff(useDb(), staff.id, id)
})
