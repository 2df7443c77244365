import { cutterSchema } from '#shared/schemas/catalog'
import { createCutter } from '../../../services/catalog/cutters'

export default defineApiHandler(async (event) => {
  const user = await requireRole(event, 'staff', 'admin')
  const input = await readBodyAs(event, cutterSchema)
  setResponseStatus(event, 201)
  return createCutter(useDb(), user.role, input)
})
