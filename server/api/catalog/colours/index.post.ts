import { colourSchema } from '#shared/schemas/catalog'
import { createColour } from '../../../services/catalog/colours'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const input = await readBodyAs(event, colourSchema)
  setResponseStatus(event, 201)
  return createColour(useDb(), input)
})
