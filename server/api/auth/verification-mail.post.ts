import { forgotPasswordSchema } from '#shared/schemas/auth'
import { requestAccountMail } from '../../services/account-mail'

// A member whose confirmation link never arrived (or ran out) asks for a new one. The same answer and the same work
// (one outbox row, composed by the sender) whether or not the address has an unconfirmed account, so it can't probe.
export default defineApiHandler(async (event) => {
  const { email } = await readBodyAs(event, forgotPasswordSchema)
  hitRateLimit([`verify-mail:${email}`, `verify-mail-ip:${clientIp(event)}`], serverConfig().signInLimitPerMinute)
  await requestAccountMail(useDb(), 'verification', email)
  return { ok: true, message: `If ${email} has an account still to confirm, a new confirmation link is on its way.` }
})
