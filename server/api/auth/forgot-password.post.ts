import { forgotPasswordSchema } from '#shared/schemas/auth'
import { requestAccountMail } from '../../services/account-mail'

export default defineApiHandler(async (event) => {
  const { email } = await readBodyAs(event, forgotPasswordSchema)
  hitRateLimit([`reset:${email}`, `reset-ip:${clientIp(event)}`], serverConfig().signInLimitPerMinute)
  // One outbox row whether or not the address has an account (the sender looks it up), so the answer, its work
  // and its time are the same either way and can't be used to probe.
  await requestAccountMail(useDb(), 'password-reset', email)
  return { ok: true, message: `If ${email} has an account, a reset link is on its way.` }
})
