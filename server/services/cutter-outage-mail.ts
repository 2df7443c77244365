import type { Knex } from 'knex'
import { serverConfig } from '../utils/config'
import { sendMail } from './mail-outbox'
import { bookingIcs } from './booking-calendar'
import type { OutagePeriod } from './cutter-outage-periods'
import { formatMinor } from './money'
import { describeLocal, minutesBetween, type UtcInterval } from './workshop-time'

export interface CalledOffNotice {
  bookingId: number
  jobId: number
  jobTitle: string
  member: { name: string; email: string }
  booking: UtcInterval
  /** What was held on the card for it (released now), or null when it was not paid yet. */
  heldMinor: number | null
  currency: string | null
  /** The next free times on the cutter that fit the job, when the mail was written. */
  offers: UtcInterval[]
}

/**
 * Tells a member at once that their booking is called off because the cutter is out of service, what happens to
 * the money, and which times are free next. Written in the transaction that calls the booking off; the calendar
 * file attached cancels the event in the member's calendar.
 */
export async function sendOutageMail(
  trx: Knex,
  notice: CalledOffNotice,
  outage: OutagePeriod,
  context: { cutterName: string; zone: string; workshopName: string },
): Promise<void> {
  const { cutterName, zone } = context
  const local = (iso: string) => describeLocal(iso, zone)
  const money = notice.heldMinor
    ? `The ${formatMinor(notice.heldMinor, notice.currency ?? 'EUR')} held on your card for it is released; nothing is charged. Your bank may take a few days to show it.`
    : 'It was not paid yet: nothing is charged, and its payment link no longer works.'
  const offers = notice.offers.length
    ? `The next free times on ${cutterName} that fit your job (${minutesBetween(notice.booking.start, notice.booking.end)} min): ${notice.offers.map((o) => local(o.start)).join('; ')}. They are not kept for you: book the one you want on your overview.`
    : `No free time on ${cutterName} fits your job yet within the booking period; book again once it is back in service.`
  await sendMail(
    {
      to: notice.member.email,
      subject: `${cutterName} is out of service: your booking is called off`,
      paragraphs: [
        `Hello ${notice.member.name},`,
        `${cutterName} is out of service from ${local(outage.start)} until about ${local(outage.end)} (${zone}): ${outage.reason}.`,
        `So that you don't travel in for nothing, your time on ${local(notice.booking.start)} for "${notice.jobTitle}" is called off. Your job stays approved.`,
        money,
        offers,
      ],
      action: { label: 'Choose a new time', url: `${serverConfig().appUrl}/` },
      attachments: [{ filename: 'booking.ics', content: await bookingIcs(trx, notice.bookingId, context.workshopName), contentType: 'text/calendar; charset=utf-8' }],
    },
    trx,
  )
}
