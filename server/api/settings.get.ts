import { workshopSettings } from '../services/settings'

// Everyone signed in reads the workshop's rules (time zone, horizon, cancellation policy).
export default defineApiHandler(async (event) => {
  await requireUser(event)
  return workshopSettings(useDb())
})
