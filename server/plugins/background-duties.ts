import { sendDueReminders } from '../services/booking-mail'
import { reconcileUnfinishedCuts } from '../services/operations'
import { releaseExpiredHolds } from '../services/payments'
import { sendPickupReminders } from '../services/pickup-reminders'

// Background duties: unpaid holds released and finishes cut off between capture and commit completed every minute,
// day-before and pickup reminders every ten. Their state
// lives in the database, so a restart picks up where it left off and never sends twice.
const HOLD_SWEEP_MS = 60_000
const REMINDER_MS = 10 * 60_000

export default defineNitroPlugin((nitro) => {
  if (process.env.KERFBOOK_REMINDERS === 'off') return
  const every = (ms: number, name: string, duty: () => Promise<unknown>) => {
    const timer = setInterval(() => {
      databaseReady()
        .then(duty)
        .catch((error) => console.error(`[${name}] failed:`, error))
    }, ms)
    timer.unref()
    nitro.hooks.hook('close', () => clearInterval(timer))
  }
  every(HOLD_SWEEP_MS, 'holds', () => releaseExpiredHolds(useDb()))
  every(HOLD_SWEEP_MS, 'reconcile', () => reconcileUnfinishedCuts(useDb()))
  every(REMINDER_MS, 'reminders', () => sendDueReminders(useDb()))
  every(REMINDER_MS, 'pickups', () => sendPickupReminders(useDb()))
})
