import type { Knex } from 'knex'
import { claimUncollected } from './operations'
import { sendPickupMail } from './pickup-mail'
import { workshopSettings } from './settings'

/** Reminds members whose parts wait longer than the workshop's setting; each job once. */
export async function sendPickupReminders(db: Knex): Promise<number> {
  const claimed = await claimUncollected(db, (await workshopSettings(db)).pickupReminderDays)
  for (const jobId of claimed) await sendPickupMail(db, jobId, 'reminder')
  return claimed.length
}
