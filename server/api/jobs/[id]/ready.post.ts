import { idParamSchema } from '#shared/schemas/auth'
import { readySchema } from '#shared/schemas/payments'
import { markReady } from '../../../services/operations'

// Parts on the shelf: the member gets a one-time pickup code (and its QR code) by e-mail.
export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const { location } = await readBodyAs(event, readySchema)
  const { record } = await markReady(useDb(), staff, id, location)
  return record
})
