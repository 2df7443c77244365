import { resetPasswordSchema } from '#shared/schemas/auth'
import { resetPassword } from '../../services/accounts'

export default defineApiHandler(async (event) => {
  const { token, password } = await readBodyAs(event, resetPasswordSchema)
  // The "password changed" mail is written with the change.
  await resetPassword(useDb(), token, password)
  return { ok: true, message: 'Your password is changed. You can sign in now.' }
})
