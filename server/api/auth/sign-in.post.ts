import { signInSchema } from '#shared/schemas/auth'
import { authenticate } from '../../services/accounts'
import { Unauthorized } from '../../utils/errors'

export default defineApiHandler(async (event) => {
  const { email, password } = await readBodyAs(event, signInSchema)
  const ip = clientIp(event)
  await beforeSignInAttempt(ip, email)
  try {
    const user = await authenticate(useDb(), email, password)
    recordSignInSuccess(ip, email)
    await beginUserSession(event, user)
    return user
  } catch (error) {
    if (error instanceof Unauthorized) recordSignInFailure(ip, email)
    throw error
  }
})
