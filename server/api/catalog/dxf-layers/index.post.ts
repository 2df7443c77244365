import { dxfLayerSchema } from '#shared/schemas/catalog'
import { createDxfLayer } from '../../../services/catalog/dxf-layers'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const input = await readBodyAs(event, dxfLayerSchema)
  setResponseStatus(event, 201)
  return createDxfLayer(useDb(), input)
})
