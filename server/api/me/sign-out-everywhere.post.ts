import { endAllSessions } from '../../utils/sessions'

// Ends every session of the account, this browser's too: for a lost phone or a password typed on a shared computer.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  await endAllSessions(useDb(), user.id)
  await clearUserSession(event)
  return { ok: true, message: 'You are signed out everywhere, here too.' }
})
