import { sendDueReminders } from '../services/booking-mail'

// Day-before reminders, checked every ten minutes. Sent-state lives in the database, so a restart
// picks up where it left off and never sends twice.
const INTERVAL_MS = 10 * 60_000

export default defineNitroPlugin((nitro) => {
  if (process.env.KERFBOOK_REMINDERS === 'off') return
  const run = () =>
    databaseReady()
      .then(() => sendDueReminders(useDb()))
      .catch((error) => console.error('[reminders] failed:', error))
  const timer = setInterval(run, INTERVAL_MS)
  timer.unref()
  nitro.hooks.hook('close', () => clearInterval(timer))
})
