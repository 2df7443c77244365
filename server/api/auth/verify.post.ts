import { verifyEmailSchema } from '#shared/schemas/auth'
import { verifyEmail } from '../../services/accounts'

export default defineApiHandler(async (event) => {
  const { token } = await readBodyAs(event, verifyEmailSchema)
  const user = await verifyEmail(useDb(), token)
  await beginUserSession(event, user)
  return user
})
