import type { Knex } from 'knex'
import { claimPickupReminder, uncollectedDue } from './operations'
import { sendPickupMail } from './pickup-mail'
import { workshopSettings } from './settings'

/**
 * Reminds members whose parts wait longer than the workshop's setting; each job once. Each job is claimed in the
 * transaction that writes its mail, so a reminder is never sent twice nor lost; a job whose mail can't be written
 * is reported, stays unclaimed for the next round, and holds back no other job.
 */
export async function sendPickupReminders(db: Knex): Promise<number> {
  const days = (await workshopSettings(db)).pickupReminderDays
  let sent = 0
  for (const jobId of await uncollectedDue(db, days)) {
    try {
      const claimed = await db.transaction(async (trx) => {
        if (!(await claimPickupReminder(trx, jobId))) return false
        await sendPickupMail(trx, jobId, 'reminder')
        return true
      })
      if (claimed) sent++
    } catch (error) {
      console.error(`[pickups] job ${jobId}: no reminder written:`, error)
    }
  }
  return sent
}
