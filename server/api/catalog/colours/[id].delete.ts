import { idParamSchema } from '#shared/schemas/auth'
import { deleteColour } from '../../../services/catalog/colours'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  await deleteColour(useDb(), id)
  setResponseStatus(event, 204)
  return null
})
