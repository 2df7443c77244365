import { idParamSchema } from '#shared/schemas/auth'
import { cutterPatchSchema } from '#shared/schemas/catalog'
import { updateCutter } from '../../../services/catalog/cutters'

export default defineApiHandler(async (event) => {
  const user = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const change = await readBodyAs(event, cutterPatchSchema)
  return updateCutter(useDb(), user.role, id, change)
})
