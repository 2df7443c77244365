import type { Knex } from 'knex'
import { claimUncollected } from './operations'
import { sendPickupMail } from './pickup-mail'
import { workshopSettings } from './settings'

/** Reminds members whose parts wait longer than the workshop's setting; each job once. */
export async function sendPickupReminders(db: Knex): Promise<number> {
  const days = (await workshopSettings(db)).pickupReminderDays
  // Each job is claimed in the transaction that writes its mail: never sent twice, never lost.
  const claimed = await db.transaction(async (trx) => {
    const jobIds = await claimUncollected(trx, days)
    for (const jobId of jobIds) await sendPickupMail(trx, jobId, 'reminder')
    return jobIds
  })
  return claimed.length
}
