import { signInSchema } from '#shared/schemas/auth'
import { authenticate } from '../../services/accounts'

export default defineApiHandler(async (event) => {
  const { email, password } = await readBodyAs(event, signInSchema)
  hitRateLimit([`email:${email}`, `ip:${clientIp(event)}`], serverConfig().signInLimitPerMinute)
  const user = await authenticate(useDb(), email, password)
  await replaceUserSession(event, { user })
  return user
})
