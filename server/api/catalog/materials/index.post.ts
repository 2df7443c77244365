import { materialSchema } from '#shared/schemas/catalog'
import { createMaterial } from '../../../services/catalog/materials'

export default defineApiHandler(async (event) => {
  const user = await requireRole(event, 'staff', 'admin')
  const input = await readBodyAs(event, materialSchema)
  setResponseStatus(event, 201)
  return createMaterial(useDb(), user.role, input)
})
