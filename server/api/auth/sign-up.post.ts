import { signUpSchema } from '#shared/schemas/auth'
import { signUp } from '../../services/accounts'
import { verificationMail } from '../../services/account-mail'

export default defineApiHandler(async (event) => {
  const input = await readBodyAs(event, signUpSchema)
  const { user, token } = await signUp(useDb(), input)
  await verificationMail(user, token)
  setResponseStatus(event, 201)
  return { ok: true, message: `We sent a confirmation link to ${user.email}.` }
})
