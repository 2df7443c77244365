import { closureSchema } from '#shared/schemas/catalog'
import { createClosure } from '../../../services/catalog/opening-hours'

export default defineApiHandler(async (event) => {
  const user = await requireRole(event, 'staff', 'admin')
  const input = await readBodyAs(event, closureSchema)
  setResponseStatus(event, 201)
  return createClosure(useDb(), user.id, input)
})
