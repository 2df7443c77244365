import { pageQuerySchema } from '#shared/schemas/paging'
import { undeliveredMail, undeliveredMailPage } from '../../../services/mail-outbox'

// Mail the outbox could not deliver yet (waiting for a retry, or dead-lettered), for the staff to see and act on; in pages with `limit`.
export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { limit, cursor } = readQueryAs(event, pageQuerySchema)
  return limit ? undeliveredMailPage(useDb(), { limit, cursor }) : undeliveredMail(useDb())
})
