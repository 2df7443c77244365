import { idParamSchema } from '#shared/schemas/auth'
import { getMaterial } from '../../../services/catalog/materials'

export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  return getMaterial(useDb(), id)
})
