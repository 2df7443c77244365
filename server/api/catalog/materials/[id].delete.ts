import { idParamSchema } from '#shared/schemas/auth'
import { removeMaterial } from '../../../services/catalog/materials'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  return removeMaterial(useDb(), id)
})
