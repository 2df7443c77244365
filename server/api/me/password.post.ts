import { changePasswordSchema } from '#shared/schemas/auth'
import { changePassword } from '../../services/accounts'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { currentPassword, newPassword } = await readBodyAs(event, changePasswordSchema)
  await changePassword(useDb(), user.id, currentPassword, newPassword, await currentSessionId(event))
  return { ok: true, message: 'Password changed.' }
})
