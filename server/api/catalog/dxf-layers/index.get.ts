import { listDxfLayers } from '../../../services/catalog/dxf-layers'

export default defineApiHandler(async (event) => {
  await requireUser(event)
  return listDxfLayers(useDb())
})
