import { sendPickupReminders } from '../../../services/pickup-reminders'

// Reminds members about parts left on the shelf now (the scheduler does it every ten minutes).
export default defineApiHandler(async (event) => {
  await requireRole(event, 'admin')
  return { sent: await sendPickupReminders(useDb()) }
})
