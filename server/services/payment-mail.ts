import type { Knex } from 'knex'
import { serverConfig } from '../utils/config'
import { sendMail } from '../utils/mailer'
import { formatMinor } from './money'
import type { LedgerKind } from './payments'


interface ReceiptContext {
  bookingId: number
  memberId: number | null
  kinds: LedgerKind[]
  detail?: string
}

const WORDS: Partial<Record<LedgerKind, { subject: string; line: (amount: string) => string }>> = {
  authorised: { subject: 'Payment received — your slot is confirmed', line: (a) => `We hold ${a} on your card. You are charged only for the minutes actually cut; the rest of the hold is released.` },
  captured: { subject: 'Receipt for your cut', line: (a) => `We charged ${a}.` },
  fee: { subject: 'Late cancellation fee', line: (a) => `Your booking was cancelled late, so the workshop's fee of ${a} was charged. The rest of the hold is released.` },
  released: { subject: 'Card hold released', line: (a) => `The hold of ${a} on your card is released; nothing was charged.` },
  refunded: { subject: 'Refund on its way', line: (a) => `We refunded ${a} to your card.` },
  charged: { subject: 'Balance paid', line: (a) => `Thanks: the balance of ${a} is paid.` },
}

/** A receipt for each new ledger entry of a booking; sent after the ledger has the entry. */
export async function sendPaymentReceipts(db: Knex, context: ReceiptContext): Promise<void> {
  if (!context.memberId) return
  const member = await db('users').where({ id: context.memberId }).first('email', 'name')
  const rows = await db('payment_ledger').where({ booking_id: context.bookingId }).whereIn('kind', context.kinds).orderBy('id', 'desc')
  for (const kind of new Set(context.kinds)) {
    const words = WORDS[kind]
    const row = rows.find((r) => r.kind === kind)
    if (!words || !row) continue
    await sendMail({
      to: member.email,
      subject: words.subject,
      paragraphs: [`Hello ${member.name},`, words.line(formatMinor(row.amount_minor, row.currency)), row.note, context.detail ?? ''].filter(Boolean),
      action: { label: 'Your payments', url: `${serverConfig().appUrl}/payments` },
    }, db)
  }
}
