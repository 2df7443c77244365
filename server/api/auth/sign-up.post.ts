import { signUpSchema } from '#shared/schemas/auth'
import { signUp } from '../../services/accounts'

export default defineApiHandler(async (event) => {
  const input = await readBodyAs(event, signUpSchema)
  // Each sign-up sends a mail: a few per address a minute, fewer still to one recipient.
  hitRateLimit([`sign-up-ip:${clientIp(event)}`], serverConfig().signInLimitPerMinute)
  hitRateLimit([`sign-up-email:${input.email}`], 3)
  // A confirmation link for a new account, or a note to the owner of an existing one, written with the change.
  await signUp(useDb(), input)
  // The same answer whether or not the address already has an account, so it can't be used to probe.
  setResponseStatus(event, 201)
  return { ok: true, message: `We sent a message to ${input.email}.` }
})
