import { sendDueReminders } from '../../../services/booking-mail'

// Runs the day-before reminders now (the scheduler runs them every ten minutes); never sends one twice.
export default defineApiHandler(async (event) => {
  await requireRole(event, 'admin')
  return { sent: await sendDueReminders(useDb()) }
})
