import { idParamSchema } from '#shared/schemas/auth'
import { finishQuoteSchema } from '#shared/schemas/payments'
import { finishQuote } from '../../../services/operations'

// The finish form's figures: timer, estimate and what finishing with these cutting minutes would charge.
export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const { actualMinutes } = readQueryAs(event, finishQuoteSchema)
  return finishQuote(useDb(), staff, id, actualMinutes)
})
