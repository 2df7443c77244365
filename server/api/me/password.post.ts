import { changePasswordSchema } from '#shared/schemas/auth'
import { changePassword } from '../../services/accounts'
import { passwordChangedMail } from '../../services/account-mail'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { currentPassword, newPassword } = await readBodyAs(event, changePasswordSchema)
  await changePassword(useDb(), user.id, currentPassword, newPassword, await currentSessionId(event))
  await passwordChangedMail(user)
  return { ok: true, message: 'Password changed.' }
})
