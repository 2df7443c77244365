import { idParamSchema } from '#shared/schemas/auth'
import { colourPatchSchema } from '#shared/schemas/catalog'
import { updateColour } from '../../../services/catalog/colours'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const change = await readBodyAs(event, colourPatchSchema)
  return updateColour(useDb(), id, change)
})
