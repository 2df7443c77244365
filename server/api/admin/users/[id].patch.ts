import { idParamSchema, userUpdateSchema } from '#shared/schemas/auth'
import { updateUser } from '../../../services/accounts'

export default defineApiHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const change = await readBodyAs(event, userUpdateSchema)
  return updateUser(useDb(), admin.id, id, change)
})
