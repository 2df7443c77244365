import { undeliveredMail } from '../../../services/mail-outbox'

// Mail the outbox could not deliver yet (waiting for a retry, or dead-lettered), for the staff to see and act on.
export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  return undeliveredMail(useDb())
})
