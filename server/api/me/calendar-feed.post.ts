import { rotateFeedToken } from '../../services/booking-calendar'

// A new private feed link; any older link stops working. The link is shown only now.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const token = await rotateFeedToken(useDb(), user.id)
  return { url: `${serverConfig().appUrl}/calendar-feed/${token}.ics` }
})
