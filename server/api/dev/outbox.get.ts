import { NotFound } from '../../utils/errors'

// Development only: the messages the local SMTP sink received, for staff to read.
export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { outboxUrl } = serverConfig()
  if (!outboxUrl) throw new NotFound('The outbox exists only in development, with the local mail sink running.')
  return $fetch(`${outboxUrl}/messages`)
})
