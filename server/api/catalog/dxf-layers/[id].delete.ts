import { idParamSchema } from '#shared/schemas/auth'
import { deleteDxfLayer } from '../../../services/catalog/dxf-layers'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  await deleteDxfLayer(useDb(), id)
  setResponseStatus(event, 204)
  return null
})
