// Paying through the Stripe fake's hosted checkout page as a browser would, and waiting for the webhook.
import { expect, inject } from 'vitest'
import type { ApiFullList } from '../../utils/api-types'
import { outboxDrained } from './helpers'
import type { Client } from './workshop-setup'

export const CARD_PAYS = '4242424242424242'
export const CARD_DECLINED = '4000000000000002'
export const CARD_ASKS_TO_CONFIRM = '4000002500003155'

export async function payCheckout(checkoutUrl: string, cardNumber = CARD_PAYS): Promise<Response> {
  const url = new URL(checkoutUrl)
  expect(url.origin).toBe(new URL(inject('stripeFakeUrl')).origin)
  const post = (step: string, fields: Record<string, string>) =>
    fetch(`${checkoutUrl}/${step}`, { method: 'POST', headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: new URLSearchParams(fields), redirect: 'manual' })
  const paid = await post('pay', { number: cardNumber, expiry: '12 / 34', cvc: '123', name: 'Juno Castellane' })
  if (cardNumber === CARD_ASKS_TO_CONFIRM) return post('authenticate', { decision: 'confirm' })
  return paid
}

/** Polls the member's payments until the booking reaches `state` (the webhook decides, not the redirect). */
export async function waitForPaymentState(member: Client, bookingId: number, state: string | string[], timeoutMs = 8000) {
  const wanted = Array.isArray(state) ? state : [state]
  const deadline = Date.now() + timeoutMs
  let last: ApiFullList<'/api/me/payments'>[number] | undefined
  while (Date.now() < deadline) {
    last = (await member.get<ApiFullList<'/api/me/payments'>>('/api/me/payments')).body.find((p) => p.bookingId === bookingId)
    if (last !== undefined && wanted.includes(last.state)) return last
    await new Promise((r) => setTimeout(r, 100))
  }
  throw new Error(`booking ${bookingId} stayed ${last?.state} instead of ${state}`)
}

/** How many messages to `to` whose subject matches the SMTP sink holds now. */
export async function countMail(to: string, subject: RegExp): Promise<number> {
  const messages = (await (await fetch(`${inject('outboxUrl')}/messages`)).json()) as { to: string[]; subject: string }[]
  return messages.filter((m) => m.to.includes(to) && subject.test(m.subject)).length
}

/** Lets webhook deliveries still under way arrive, and the outbox send their mails, before a count. */
export async function settle(ms = 1000): Promise<void> {
  await new Promise((r) => setTimeout(r, ms))
  await outboxDrained()
}
