import { resetPasswordSchema } from '#shared/schemas/auth'
import { resetPassword } from '../../services/accounts'
import { passwordChangedMail } from '../../services/account-mail'

export default defineApiHandler(async (event) => {
  const { token, password } = await readBodyAs(event, resetPasswordSchema)
  const user = await resetPassword(useDb(), token, password)
  await passwordChangedMail(user)
  return { ok: true, message: 'Your password is changed. You can sign in now.' }
})
