import type { Knex } from 'knex'
import { serverConfig } from '../utils/config'
import { sendMail } from './mail-outbox'
import { formatMinor } from './money'
import type { LedgerKind } from './payments'

const WORDS: Partial<Record<LedgerKind, { subject: string; line: (amount: string) => string }>> = {
  authorised: { subject: 'Payment received — your slot is confirmed', line: (a) => `We hold ${a} on your card. You are charged only for the minutes actually cut; the rest of the hold is released.` },
  captured: { subject: 'Receipt for your cut', line: (a) => `We charged ${a}.` },
  fee: { subject: 'Late cancellation fee', line: (a) => `Your booking was cancelled late, so the workshop's fee of ${a} was charged. The rest of the hold is released.` },
  released: { subject: 'Card hold released', line: (a) => `The hold of ${a} on your card is released; nothing was charged.` },
  refunded: { subject: 'Refund on its way', line: (a) => `We refunded ${a} to your card.` },
  owed: { subject: 'Balance to pay for your cut', line: (a) => `The cut cost more than the hold on your card covered: ${a} is still to pay. Pay it under "Your payments" with the button below.` },
  charged: { subject: 'Balance paid', line: (a) => `Thanks: the balance of ${a} is paid.` },
}

/**
 * The member's receipt for one new ledger entry. payments.ts writes it in the transaction that writes the entry, so
 * the entry and its mail commit together: one mail per money event, never none, never two.
 */
export async function queueReceipt(trx: Knex, memberId: number | null, entry: { kind: LedgerKind; amountMinor: number; currency: string; note?: string }, detail = ''): Promise<void> {
  const words = WORDS[entry.kind]
  if (!words || !memberId) return
  const member = await trx('users').where({ id: memberId }).first('email', 'name')
  await sendMail(
    {
      to: member.email,
      subject: words.subject,
      paragraphs: [`Hello ${member.name},`, words.line(formatMinor(entry.amountMinor, entry.currency)), entry.note ?? '', detail].filter(Boolean),
      action: { label: 'Your payments', url: `${serverConfig().appUrl}/payments` },
    },
    trx,
  )
}
