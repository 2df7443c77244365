import { NotFound } from '../../utils/errors'

// Development only, admins only: the messages the local SMTP sink received (reset links among them).
// A production build answers 404 to everyone, whatever OUTBOX_URL says.
export default defineApiHandler(async (event) => {
  if (!import.meta.dev) throw new NotFound()
  await requireRole(event, 'admin')
  const { outboxUrl } = serverConfig()
  if (!outboxUrl) throw new NotFound('The outbox exists only in development, with the local mail sink running.')
  return $fetch(`${outboxUrl}/messages`)
})
