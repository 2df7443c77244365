import { escapeHtml, formatMinorUnits, htmlDocument } from './html'
import type { FakeLineItem } from './objects'
import type { StoredCheckoutSession } from './store'
import { TEST_CARDS, type CardField } from './test-cards'

export type CheckoutField = CardField | 'email' | 'name'

export interface CheckoutFormState {
  /** What the payer typed, echoed back (escaped) after a failed attempt; the security code is never echoed. */
  values: Partial<Record<Exclude<CheckoutField, 'cvc'>, string>>
  fieldErrors: Partial<Record<CheckoutField, string>>
  /** A payment-level problem such as a declined card. */
  paymentError?: string
}

const FIELD_LABELS: Record<CheckoutField, string> = {
  email: 'E-mail for the receipt',
  number: 'Card number',
  expiry: 'Expiry date',
  cvc: 'Security code',
  name: 'Name on card',
}

function orderSummary(stored: StoredCheckoutSession): string {
  const { session } = stored
  const currency = session.currency!
  const rows = stored.lineItems
    .map(
      (item: FakeLineItem) =>
        `<tr><td>${escapeHtml(item.description ?? '')}</td><td class="amount">${escapeHtml(item.quantity ?? 1)}</td><td class="amount">${escapeHtml(formatMinorUnits(item.amount_total, currency))}</td></tr>`,
    )
    .join('\n')
  return `<section class="panel" aria-labelledby="summary-heading">
<h2 id="summary-heading">Order</h2>
<table>
<thead><tr><th scope="col">Item</th><th scope="col" class="amount">Qty</th><th scope="col" class="amount">Amount</th></tr></thead>
<tbody>
${rows}
</tbody>
<tfoot><tr><td colspan="2">Total</td><td class="amount">${escapeHtml(formatMinorUnits(session.amount_total!, currency))}</td></tr></tfoot>
</table>
</section>`
}

function field(name: CheckoutField, form: CheckoutFormState, attributes: string, hint?: string): string {
  const id = `field-${name}`
  const error = form.fieldErrors[name]
  const describedBy = [hint ? `${id}-hint` : '', error ? `${id}-error` : ''].filter(Boolean).join(' ')
  const value = name === 'cvc' ? '' : (form.values[name] ?? '')
  return `<div>
<label for="${id}">${escapeHtml(FIELD_LABELS[name])}</label>
${hint ? `<span class="hint" id="${id}-hint">${escapeHtml(hint)}</span>` : ''}
<input id="${id}" name="${name}" value="${escapeHtml(value)}" ${attributes}${describedBy ? ` aria-describedby="${describedBy}"` : ''}${error ? ' aria-invalid="true"' : ''}>
${error ? `<p class="field-error" id="${id}-error">${escapeHtml(error)}</p>` : ''}
</div>`
}

function errorSummary(form: CheckoutFormState): string {
  const fieldErrors = Object.entries(form.fieldErrors) as [CheckoutField, string][]
  if (!form.paymentError && fieldErrors.length === 0) return ''
  const items = fieldErrors.map(([name, message]) => `<li><a href="#field-${name}">${escapeHtml(FIELD_LABELS[name])}: ${escapeHtml(message)}</a></li>`).join('')
  return `<div class="alert" role="alert">
${form.paymentError ? `<p><strong>${escapeHtml(form.paymentError)}</strong></p>` : '<p><strong>Please check the form.</strong></p>'}
${items ? `<ul>${items}</ul>` : ''}
</div>`
}

function cancelForm(stored: StoredCheckoutSession): string {
  if (!stored.session.cancel_url) return ''
  return `<form method="post" action="/checkout/${escapeHtml(stored.session.id)}/cancel"><button type="submit" class="secondary">Cancel and go back</button></form>`
}

export function renderPaymentForm(stored: StoredCheckoutSession, form: CheckoutFormState): string {
  const { session } = stored
  const total = formatMinorUnits(session.amount_total!, session.currency!)
  const email = session.customer_email
    ? `<input type="hidden" name="email" value="${escapeHtml(session.customer_email)}"><p>Receipt to <strong>${escapeHtml(session.customer_email)}</strong></p>`
    : field('email', form, 'type="email" autocomplete="email" required')
  const testCards = TEST_CARDS.map((card) => `<li><code>${escapeHtml(card.number.replace(/(\d{4})(?=\d)/g, '$1 '))}</code> — ${escapeHtml(card.summary)}</li>`).join('')
  // A payment captured later is a hold on the card: the page says so instead of "Pay".
  const hold = stored.paymentIntentData.captureMethod === 'manual'
  const action = hold ? `Hold ${total} on your card` : `Pay ${total}`
  const body = `<h1>${escapeHtml(action)}</h1>
${hold ? '<p>Nothing is charged now: the amount is reserved on your card, and only what the shop finally charges is taken.</p>' : ''}
${errorSummary(form)}
${orderSummary(stored)}
<section class="panel" aria-labelledby="card-heading">
<h2 id="card-heading">Card details</h2>
<form method="post" action="/checkout/${escapeHtml(session.id)}/pay" novalidate>
${email}
${field('number', form, 'inputmode="numeric" autocomplete="cc-number" required', 'A test card number, see the list below')}
<div class="row">
${field('expiry', form, 'autocomplete="cc-exp" placeholder="MM/YY" required', 'Month and year, MM/YY')}
${field('cvc', form, 'inputmode="numeric" autocomplete="cc-csc" required', '3 or 4 digits')}
</div>
${field('name', form, 'autocomplete="cc-name"', 'Optional')}
<div class="actions"><button type="submit" class="primary">${escapeHtml(action)}</button></div>
</form>
<div class="actions">${cancelForm(stored)}</div>
<details>
<summary>Test card numbers</summary>
<ul>${testCards}</ul>
<p>Use any future expiry date and any three-digit security code.</p>
</details>
</section>`
  return htmlDocument(`${action} — test checkout`, body)
}

export function renderAuthenticationStep(stored: StoredCheckoutSession): string {
  const { session } = stored
  const total = formatMinorUnits(session.amount_total!, session.currency!)
  const last4 = stored.awaitingAuthentication!.card.last4
  const body = `<h1>Confirm this payment</h1>
<section class="panel" aria-labelledby="confirm-heading">
<h2 id="confirm-heading">Your card issuer asks you to confirm</h2>
<p>Confirm the payment of <strong>${escapeHtml(total)}</strong> with the card ending in <strong>${escapeHtml(last4)}</strong>.</p>
<form method="post" action="/checkout/${escapeHtml(session.id)}/authenticate">
<div class="actions">
<button type="submit" name="decision" value="confirm" class="primary">Confirm payment</button>
<button type="submit" name="decision" value="refuse" class="secondary">Refuse</button>
</div>
</form>
</section>`
  return htmlDocument('Confirm this payment — test checkout', body)
}

export function renderMessage(title: string, message: string, link?: { href: string; text: string }): string {
  const action = link ? `<p><a class="button-link primary" href="${escapeHtml(link.href)}">${escapeHtml(link.text)}</a></p>` : ''
  return htmlDocument(`${title} — test checkout`, `<h1>${escapeHtml(title)}</h1>\n<section class="panel"><p>${escapeHtml(message)}</p>${action}</section>`)
}
