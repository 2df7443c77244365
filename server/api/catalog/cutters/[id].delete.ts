import { idParamSchema } from '#shared/schemas/auth'
import { deleteCutter } from '../../../services/catalog/cutters'

export default defineApiHandler(async (event) => {
  const user = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  await deleteCutter(useDb(), user.role, id)
  setResponseStatus(event, 204)
  return null
})
