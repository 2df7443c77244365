import { signOffSchema } from '#shared/schemas/catalog'
import { recordSignOff } from '../../services/catalog/sign-offs'

export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const input = await readBodyAs(event, signOffSchema)
  setResponseStatus(event, 201)
  return recordSignOff(useDb(), staff.id, input)
})
