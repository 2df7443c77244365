import { memberHome } from '../../services/home'

// The member's overview: open jobs and what each waits for, the next booking, parts to collect, money owed.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  return memberHome(useDb(), user.id)
})
