import type { FakeCard } from './objects'

export type CardBehaviour = 'authorises' | 'declines' | 'requires_authentication'

/** Stripe's published test card numbers and what each one does (Stripe testing docs, "Cards by brand", "Declined payments", "3D Secure authentication"). */
export const TEST_CARDS: readonly { number: string; behaviour: CardBehaviour; brand: string; summary: string }[] = [
  { number: '4242424242424242', behaviour: 'authorises', brand: 'visa', summary: 'Succeeds' },
  { number: '4000000000000002', behaviour: 'declines', brand: 'visa', summary: 'Is declined (card_declined)' },
  { number: '4000002500003155', behaviour: 'requires_authentication', brand: 'visa', summary: 'Asks the payer to confirm the payment first' },
]

export interface CardEntry {
  number: string
  expiry: string
  cvc: string
}

export type CardField = keyof CardEntry

export type CardReading =
  | { ok: true; card: FakeCard; behaviour: CardBehaviour }
  | { ok: false; errors: Partial<Record<CardField, string>> }

/** Accepts "MM/YY", "MM / YY" or "MMYY"; a card is valid to the end of its expiry month. */
function parseExpiry(text: string, now: Date): { month: number; year: number } | string {
  const match = /^(\d{2})\s*\/?\s*(\d{2})$/.exec(text.trim())
  if (!match) return 'Enter the expiry date as MM/YY, for example 12/34.'
  const month = Number(match[1])
  const year = 2000 + Number(match[2])
  if (month < 1 || month > 12) return 'The expiry month must be between 01 and 12.'
  const firstDayAfterExpiry = Date.UTC(year, month, 1)
  if (firstDayAfterExpiry <= now.getTime()) return 'This expiry date is in the past; any future date works for a test card.'
  return { month, year }
}

/** Reads what the payer typed into the checkout form; only Stripe's test numbers are accepted. */
export function readCardEntry(entry: CardEntry, now: Date): CardReading {
  const errors: Partial<Record<CardField, string>> = {}
  const digits = entry.number.replace(/[\s-]/g, '')
  const testCard = TEST_CARDS.find((card) => card.number === digits)
  if (!testCard) errors.number = 'This is a test checkout: use one of the test card numbers listed on this page.'
  const expiry = parseExpiry(entry.expiry, now)
  if (typeof expiry === 'string') errors.expiry = expiry
  // Any three-digit CVC works with test cards (four for American Express) — Stripe testing docs.
  if (!/^\d{3,4}$/.test(entry.cvc.trim())) errors.cvc = 'Enter the 3 or 4 digit security code; any digits work for a test card.'
  if (!testCard || typeof expiry === 'string' || Object.keys(errors).length > 0) return { ok: false, errors }
  return {
    ok: true,
    behaviour: testCard.behaviour,
    card: { brand: testCard.brand, last4: digits.slice(-4), exp_month: expiry.month, exp_year: expiry.year, funding: 'credit' },
  }
}
