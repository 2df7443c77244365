import { sendDueReminders } from '../services/booking-mail'
import { reconcileUnfinishedCuts } from '../services/operations'
import { releaseExpiredHolds } from '../services/payments'
import { sendPickupReminders } from '../services/pickup-reminders'
import { sweepAbandonedTasks } from '../utils/analysis-remote'
import { runAlone } from '../utils/duty-lock'

// Background duties: unpaid holds released and finishes cut off between capture and commit completed every minute,
// day-before and pickup reminders every ten. Their state
// lives in the database, so a restart picks up where it left off and never sends twice. With several app servers on
// one PostgreSQL database, each duty runs on one of them at a time (runAlone), and claims every row it acts on.
// KERFBOOK_DUTY_EVERY_MS runs every duty at that interval instead (the test of several app servers).
const HOLD_SWEEP_MS = Number(process.env.KERFBOOK_DUTY_EVERY_MS) || 60_000
const REMINDER_MS = Number(process.env.KERFBOOK_DUTY_EVERY_MS) || 10 * 60_000

export default defineNitroPlugin((nitro) => {
  if (process.env.KERFBOOK_REMINDERS === 'off') return
  // One duty at a time in this process: on PostgreSQL each holds a pooled connection for its lock while it works
  // on others, so duties side by side could take the whole pool. A duty already waiting its turn is not queued twice.
  let turn: Promise<unknown> = Promise.resolve()
  const waiting = new Set<string>()
  const every = (ms: number, name: string, duty: () => Promise<unknown>) => {
    const timer = setInterval(() => {
      if (waiting.has(name)) return
      waiting.add(name)
      turn = turn
        .then(() => databaseReady())
        .then(() => {
          waiting.delete(name)
          return runAlone(useDb(), name, duty)
        })
        .catch((error) => console.error(`[${name}] failed:`, error))
        .finally(() => waiting.delete(name))
    }, ms)
    timer.unref()
    nitro.hooks.hook('close', () => clearInterval(timer))
  }
  every(HOLD_SWEEP_MS, 'holds', () => releaseExpiredHolds(useDb()))
  every(HOLD_SWEEP_MS, 'reconcile', () => reconcileUnfinishedCuts(useDb()))
  every(REMINDER_MS, 'reminders', () => sendDueReminders(useDb()))
  every(REMINDER_MS, 'pickups', () => sendPickupReminders(useDb()))
  every(REMINDER_MS, 'analysis-tasks', () => sweepAbandonedTasks(useDb()))
})
