import { feedOwner, memberFeedIcs } from '../../services/booking-calendar'
import { workshopSettings } from '../../services/settings'
import { NotFound } from '../../utils/errors'

// A member's private calendar feed; the secret in the address is the only key.
export default defineApiHandler(async (event) => {
  const token = String(getRouterParam(event, 'token') ?? '').replace(/\.ics$/, '')
  if (!/^[A-Za-z0-9_-]{20,64}$/.test(token)) throw new NotFound('No such calendar.')
  const memberId = await feedOwner(useDb(), token)
  setResponseHeader(event, 'content-type', 'text/calendar; charset=utf-8')
  return memberFeedIcs(useDb(), memberId, (await workshopSettings(useDb())).workshopName)
})
