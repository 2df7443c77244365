import { idParamSchema } from '#shared/schemas/auth'
import { retryMailNow } from '../../../../services/mail-outbox'
import { Conflict, NotFound } from '../../../../utils/errors'

// Staff send an undelivered mail again now (after the mail server is fixed, or an address corrected).
export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const outcome = await retryMailNow(useDb(), id)
  if (outcome === 'missing') throw new NotFound('No mail with that number.')
  if (outcome === 'delivered') throw new Conflict('This mail is sent, or being sent right now.')
  return { queued: true }
})
