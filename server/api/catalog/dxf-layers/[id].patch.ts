import { idParamSchema } from '#shared/schemas/auth'
import { dxfLayerPatchSchema } from '#shared/schemas/catalog'
import { updateDxfLayer } from '../../../services/catalog/dxf-layers'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  return updateDxfLayer(useDb(), id, await readBodyAs(event, dxfLayerPatchSchema))
})
