import { signInSchema } from '#shared/schemas/auth'
import { authenticate } from '../../services/accounts'

export default defineApiHandler(async (event) => {
  const { email, password } = await readBodyAs(event, signInSchema)
  const emailKey = `sign-in-email:${email}`
  const ipKey = `sign-in-ip:${clientIp(event)}`
  const limit = serverConfig().signInLimitPerMinute
  assertUnderRateLimit([emailKey, ipKey], limit)
  // Every attempt from an address counts; for an e-mail only the failed ones, so its owner isn't locked out by signing in.
  recordRateLimitHit([ipKey])
  try {
    const user = await authenticate(useDb(), email, password)
    await replaceUserSession(event, { user })
    return user
  } catch (error) {
    recordRateLimitHit([emailKey])
    throw error
  }
})
