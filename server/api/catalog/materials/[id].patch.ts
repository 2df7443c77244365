import { idParamSchema } from '#shared/schemas/auth'
import { materialPatchSchema } from '#shared/schemas/catalog'
import { updateMaterial } from '../../../services/catalog/materials'

export default defineApiHandler(async (event) => {
  const user = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const change = await readBodyAs(event, materialPatchSchema)
  return updateMaterial(useDb(), user.role, id, change)
})
