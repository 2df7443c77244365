import { revokeFeedToken } from '../../services/booking-calendar'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  await revokeFeedToken(useDb(), user.id)
  setResponseStatus(event, 204)
  return null
})
