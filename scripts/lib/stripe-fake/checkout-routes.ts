import { z } from 'zod'
import { renderAuthenticationStep, renderMessage, renderPaymentForm, type CheckoutFormState } from './checkout-page'
import { attemptCardPayment, finishAuthentication, type PaymentAttempt } from './payment-flow'
import type { StoredCheckoutSession, StripeFakeState } from './store'
import { readCardEntry } from './test-cards'

export interface PageResponse {
  status: number
  headers: Record<string, string>
  body: string
}

const html = (status: number, body: string): PageResponse => ({ status, headers: { 'content-type': 'text/html; charset=utf-8' }, body })
// 303 See Other, so the browser follows a form POST with a GET.
const redirect = (location: string): PageResponse => ({ status: 303, headers: { location }, body: '' })

/** Checkout's documented placeholder in success_url, replaced with the session id on the way back. */
function successLocation(stored: StoredCheckoutSession): string | null {
  return stored.session.success_url?.replaceAll('{CHECKOUT_SESSION_ID}', stored.session.id) ?? null
}

function afterCompletion(stored: StoredCheckoutSession): PageResponse {
  const location = successLocation(stored)
  return location ? redirect(location) : html(200, renderMessage('Payment received', 'Thank you: the payment went through. You can close this page.'))
}

/** What a session that can no longer be paid shows instead of the form. */
function closedSessionPage(stored: StoredCheckoutSession): PageResponse | undefined {
  if (stored.session.status === 'complete') {
    const location = successLocation(stored)
    return html(200, renderMessage('Payment complete', 'This checkout has already been paid.', location ? { href: location, text: 'Continue' } : undefined))
  }
  if (stored.session.status === 'expired') {
    const back = stored.session.cancel_url
    return html(410, renderMessage('Checkout expired', 'This checkout has expired and can no longer be paid. Start again from the booking.', back ? { href: back, text: 'Go back' } : undefined))
  }
  return undefined
}

function attemptOutcome(stored: StoredCheckoutSession, attempt: PaymentAttempt, values: CheckoutFormState['values']): PageResponse {
  if (attempt.result === 'completed') return afterCompletion(stored)
  // After the 3D Secure-like step is asked for, show it at the session's own address so a reload keeps it.
  if (attempt.result === 'authentication_required') return redirect(`/checkout/${stored.session.id}`)
  // 402 mirrors the API's status for a card error; the session stays open for another try (Checkout behaviour).
  return html(402, renderPaymentForm(stored, { values, fieldErrors: {}, paymentError: attempt.message }))
}

function pay(state: StripeFakeState, stored: StoredCheckoutSession, form: URLSearchParams, now: Date): PageResponse {
  const entry = { number: form.get('number') ?? '', expiry: form.get('expiry') ?? '', cvc: form.get('cvc') ?? '' }
  const email = stored.session.customer_email ?? (form.get('email') ?? '').trim()
  const values = { email, number: entry.number, expiry: entry.expiry, name: form.get('name') ?? '' }
  const reading = readCardEntry(entry, now)
  const fieldErrors: CheckoutFormState['fieldErrors'] = reading.ok ? {} : { ...reading.errors }
  if (!z.email().safeParse(email).success) fieldErrors.email = 'Enter an e-mail address such as member@example.org.'
  if (!reading.ok || Object.keys(fieldErrors).length > 0) return html(422, renderPaymentForm(stored, { values, fieldErrors }))
  return attemptOutcome(stored, attemptCardPayment(state, stored, reading.card, reading.behaviour, email), values)
}

/**
 * The hosted-checkout stand-in: GET /checkout/:id shows the form, POST …/pay submits a card,
 * POST …/authenticate answers the confirmation step, POST …/cancel returns to cancel_url.
 */
export function handleCheckoutPage(state: StripeFakeState, method: string, path: string, body: string): PageResponse {
  const [, , sessionId = '', action = '', ...rest] = path.split('/')
  const stored = state.checkoutSessions.get(decodeURIComponent(sessionId))
  if (!stored || rest.length > 0) return html(404, renderMessage('Checkout not found', 'There is no checkout at this address.'))
  const form = new URLSearchParams(body)

  if (method === 'POST' && action === 'cancel') {
    const back = stored.session.cancel_url
    return back ? redirect(back) : html(200, renderMessage('Payment not made', 'You left the checkout without paying.'))
  }
  const closed = closedSessionPage(stored)
  if (closed) return closed
  if (method === 'GET' && action === '') {
    return html(200, stored.awaitingAuthentication ? renderAuthenticationStep(stored) : renderPaymentForm(stored, { values: {}, fieldErrors: {} }))
  }
  if (method === 'POST' && action === 'pay') return pay(state, stored, form, new Date(state.nowSeconds() * 1000))
  if (method === 'POST' && action === 'authenticate' && stored.awaitingAuthentication) {
    const values = { email: stored.awaitingAuthentication.email }
    return attemptOutcome(stored, finishAuthentication(state, stored, form.get('decision') === 'confirm'), values)
  }
  return html(404, renderMessage('Checkout not found', 'There is no such step in this checkout.'))
}
