import { feedStatus } from '../../services/booking-calendar'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  return feedStatus(useDb(), user.id)
})
