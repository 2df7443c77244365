import { idParamSchema } from '#shared/schemas/auth'
import { deleteClosure } from '../../../services/catalog/opening-hours'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  await deleteClosure(useDb(), id)
  setResponseStatus(event, 204)
  return null
})
