import type { Knex } from 'knex'
import { serverConfig } from '../utils/config'
import { sendMail } from './mail-outbox'
import { nowIso } from '../utils/rows'
import { bookingIcs } from './booking-calendar'
import type { BookingRow } from './bookings'
import { workshopSettings } from './settings'
import { describeLocal, inZone } from './workshop-time'

type BookingNews = 'booked' | 'moved' | 'cancelled' | 'reminder'

const SUBJECTS: Record<BookingNews, string> = {
  booked: 'Cutter booked',
  moved: 'Your booking was moved',
  cancelled: 'Your booking was cancelled',
  reminder: 'Reminder: your cutter time is tomorrow',
}

/** Tells the member about their booking, with the calendar file attached; pass the change's transaction to write the mail with it. */
export async function sendBookingMail(db: Knex, booking: BookingRow, news: BookingNews, detail = ''): Promise<boolean> {
  if (!booking.member_id) return false
  const member = await db('users').where({ id: booking.member_id }).first('email', 'name')
  const cutter = await db('cutters').where({ id: booking.cutter_id }).first('name')
  const settings = await workshopSettings(db)
  const when = `${describeLocal(booking.starts_at, settings.timeZone)} to ${inZone(booking.ends_at, settings.timeZone).toFormat('HH:mm')} (${settings.timeZone})`
  const lines: Record<BookingNews, string[]> = {
    booked: [`${cutter.name} is yours on ${when}.`, 'Come a few minutes early; the staff run the cut with you.'],
    moved: [`Your time on ${cutter.name} is now ${when}.`],
    cancelled: [`Your time on ${cutter.name} on ${when} is cancelled.`],
    reminder: [`Your time on ${cutter.name} is tomorrow: ${when}.`, 'Bring your material if you supply your own, and closed shoes.'],
  }
  return sendMail({
    to: member.email,
    subject: SUBJECTS[news],
    paragraphs: [`Hello ${member.name},`, ...lines[news], detail].filter(Boolean),
    action: booking.job_id ? { label: 'Open the job', url: `${serverConfig().appUrl}/jobs/${booking.job_id}` } : undefined,
    attachments: [{ filename: 'booking.ics', content: await bookingIcs(db, booking.id, settings.workshopName), contentType: 'text/calendar; charset=utf-8' }],
  }, db)
}

/**
 * Day-before reminders. Each booking is claimed (reminder_sent_at set where still empty) in the transaction that
 * writes its mail, so a restart or a second runner never sends a reminder twice, nor loses one.
 */
export async function sendDueReminders(db: Knex, now = new Date()): Promise<number> {
  const settings = await workshopSettings(db)
  const tomorrow = inZone(now.toISOString(), settings.timeZone).plus({ days: 1 }).startOf('day')
  const from = tomorrow.toUTC().toISO()!
  const to = tomorrow.plus({ days: 1 }).toUTC().toISO()!
  const due = await db<BookingRow>('bookings').where({ status: 'confirmed', kind: 'job' }).whereNull('reminder_sent_at').where('starts_at', '>=', from).where('starts_at', '<', to)
  let sent = 0
  for (const booking of due) {
    const queued = await db.transaction(async (trx) => {
      const claimed = await trx('bookings').where({ id: booking.id }).whereNull('reminder_sent_at').update({ reminder_sent_at: nowIso() })
      return claimed === 1 && (await sendBookingMail(trx, booking, 'reminder'))
    })
    if (queued) sent++
  }
  return sent
}
