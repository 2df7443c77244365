import { forgotPasswordSchema } from '#shared/schemas/auth'
import { requestPasswordReset } from '../../services/accounts'
import { passwordResetMail } from '../../services/account-mail'

export default defineApiHandler(async (event) => {
  const { email } = await readBodyAs(event, forgotPasswordSchema)
  hitRateLimit([`reset:${email}`, `reset-ip:${clientIp(event)}`], serverConfig().signInLimitPerMinute)
  const issued = await requestPasswordReset(useDb(), email)
  if (issued) await passwordResetMail(issued.user, issued.token)
  // The same answer whether or not the address has an account, so it can't be used to probe.
  return { ok: true, message: `If ${email} has an account, a reset link is on its way.` }
})
