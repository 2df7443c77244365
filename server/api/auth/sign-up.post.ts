import { signUpSchema } from '#shared/schemas/auth'
import { signUp } from '../../services/accounts'
import { signUpAttemptMail, verificationMail } from '../../services/account-mail'

export default defineApiHandler(async (event) => {
  const input = await readBodyAs(event, signUpSchema)
  // Each sign-up sends a mail: a few per address a minute, fewer still to one recipient.
  hitRateLimit([`sign-up-ip:${clientIp(event)}`], serverConfig().signInLimitPerMinute)
  hitRateLimit([`sign-up-email:${input.email}`], 3)
  const result = await signUp(useDb(), input)
  if (result.created) await verificationMail(result.user, result.token)
  else await signUpAttemptMail(result.existing)
  // The same answer whether or not the address already has an account, so it can't be used to probe.
  setResponseStatus(event, 201)
  return { ok: true, message: `We sent a message to ${input.email}.` }
})
