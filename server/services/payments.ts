import type { Knex } from 'knex'
import type Stripe from 'stripe'
import type { SessionUser } from '#shared/roles'
import { Conflict, DomainError, InvalidInput, NotFound } from '../utils/errors'
import { nowIso } from '../utils/rows'
import { serverConfig } from '../utils/config'
import { useStripe } from '../utils/stripe'
import { inBookingTransaction, type BookingRow } from './bookings'
import { getCutter } from './catalog/cutters'
import { transitionJob } from './job-states'
import { currentFiles, jobEstimate, type JobRow } from './jobs'
import { balancesOwed } from './balance'
import { queueReceipt } from './payment-mail'
import { formatMinor, percentOf, priceCut, withBuffer } from './money'
import { workshopSettings } from './settings'

// `owed`: what a cut cost beyond the hold, asked for separately; `charged` is its payment.
export type LedgerKind = 'authorised' | 'captured' | 'fee' | 'released' | 'refunded' | 'charged' | 'owed'

export interface LedgerRow {
  id: number
  booking_id: number | null
  job_id: number | null
  member_id: number | null
  kind: LedgerKind
  amount_minor: number
  currency: string
  stripe_object_id: string
  ledger_key: string
  note: string
  created_at: string
}

export type PaymentState = 'awaiting' | 'authorised' | 'captured' | 'refunded' | 'partly-refunded' | 'released' | 'balance-due'

interface PaidBooking extends BookingRow {
  estimate_minor: number | null
  authorised_minor: number | null
  currency: string | null
  checkout_session_id: string | null
  payment_intent_id: string | null
  balance_checkout_session_id: string | null
  balance_checkout_url: string | null
}

class PaymentServiceError extends DomainError {
  constructor(message: string) {
    super(message, 502)
  }
}

/**
 * Records one money event once: a second report of the same event (same key) changes nothing. The member's receipt
 * for a new entry is written in the same transaction (`detail`: a line to add to it), so it goes out exactly once.
 */
async function record(
  db: Knex,
  booking: PaidBooking,
  entry: { kind: LedgerKind; amountMinor: number; currency: string; objectId: string; key: string; note?: string },
  detail?: string,
): Promise<boolean> {
  return db.transaction(async (trx) => {
    const inserted = await insertedNow(
      trx('payment_ledger')
        .insert({ booking_id: booking.id, job_id: booking.job_id, member_id: booking.member_id, kind: entry.kind, amount_minor: entry.amountMinor, currency: entry.currency, stripe_object_id: entry.objectId, ledger_key: entry.key, note: entry.note ?? '' })
        .onConflict('ledger_key')
        .ignore(),
    )
    if (inserted) await queueReceipt(trx, booking.member_id, entry, detail)
    return inserted
  })
}

/**
 * True when an insert … on conflict ignore added its row. The driver's insert id can't tell: when nothing is
 * inserted it reports the connection's previous row id. RETURNING yields a row only for a row written now.
 */
async function insertedNow(insert: Knex.QueryBuilder): Promise<boolean> {
  const rows = await insert.returning('id')
  return rows.length > 0
}

/** The booking's payment state, derived from its ledger only. */
export function paymentStateOf(rows: Pick<LedgerRow, 'kind' | 'amount_minor'>[]): { state: PaymentState; authorisedMinor: number; capturedMinor: number; refundedMinor: number } {
  const sum = (...kinds: LedgerKind[]) => rows.filter((r) => kinds.includes(r.kind)).reduce((n, r) => n + r.amount_minor, 0)
  const authorisedMinor = sum('authorised')
  const capturedMinor = sum('captured', 'fee', 'charged')
  const refundedMinor = sum('refunded')
  let state: PaymentState = 'awaiting'
  if (sum('owed') > sum('charged')) state = 'balance-due'
  else if (refundedMinor > 0) state = refundedMinor >= capturedMinor ? 'refunded' : 'partly-refunded'
  else if (capturedMinor > 0) state = 'captured'
  else if (rows.some((r) => r.kind === 'released')) state = 'released'
  else if (authorisedMinor > 0) state = 'authorised'
  return { state, authorisedMinor, capturedMinor, refundedMinor }
}

export async function ledgerFor(db: Knex, bookingId: number): Promise<LedgerRow[]> {
  return db<LedgerRow>('payment_ledger').where({ booking_id: bookingId }).orderBy('id')
}

async function jobPrice(db: Knex, job: JobRow) {
  const cutter = await getCutter(db, job.cutter_id)
  const estimate = await jobEstimate(db, job, await currentFiles(db, job.id))
  return { cutter, estimate }
}

/**
 * Opens a Checkout Session that authorises the estimate plus the workshop's buffer, captured later.
 * Runs after the held booking has committed; if Stripe can't be reached the hold is released again.
 */
export async function startCheckout(db: Knex, bookingId: number): Promise<{ url: string; authorisedMinor: number; estimateMinor: number }> {
  const booking = await db<PaidBooking>('bookings').where({ id: bookingId }).first()
  if (!booking?.job_id) throw new NotFound('No such booking.')
  const job = (await db<JobRow>('jobs').where({ id: booking.job_id }).first())!
  const member = await db('users').where({ id: booking.member_id }).first('email')
  const settings = await workshopSettings(db)
  const { cutter, estimate } = await jobPrice(db, job)
  const estimateMinor = estimate.totalPriceMinor
  const authorisedMinor = withBuffer(estimateMinor, settings.paymentBufferPercent)
  const appUrl = serverConfig().appUrl
  let session: Stripe.Checkout.Session
  try {
    session = await useStripe().checkout.sessions.create(
      {
        mode: 'payment',
        line_items: [{ quantity: 1, price_data: { currency: cutter.currency.toLowerCase(), unit_amount: authorisedMinor, product_data: { name: `${cutter.name}: ${job.title} (estimate + ${settings.paymentBufferPercent} % buffer, held)` } } }],
        payment_intent_data: { capture_method: 'manual', metadata: { bookingId: String(booking.id), jobId: String(job.id) } },
        metadata: { bookingId: String(booking.id), purpose: 'booking' },
        client_reference_id: `booking-${booking.id}`,
        customer_email: member.email,
        // Stripe takes 30 min to 24 h; a minute over the hold keeps the session open until the hold is released.
        expires_at: Math.floor(Date.now() / 1000) + (Math.max(30, settings.paymentHoldMinutes) + 1) * 60,
        success_url: `${appUrl}/bookings?paid=${booking.id}&session={CHECKOUT_SESSION_ID}`,
        cancel_url: `${appUrl}/bookings?unpaid=${booking.id}`,
      },
      { idempotencyKey: `checkout-booking-${booking.id}` },
    )
  } catch (error) {
    await releaseUnpaidBooking(db, booking.id, 'Payment could not be started')
    throw new PaymentServiceError(`The payment service did not answer, so the slot was released. Please try again in a minute. (${(error as Error).message})`)
  }
  await db('bookings').where({ id: booking.id }).update({ checkout_session_id: session.id, checkout_url: session.url, estimate_minor: estimateMinor, authorised_minor: authorisedMinor, currency: cutter.currency, updated_at: nowIso() })
  return { url: session.url!, authorisedMinor, estimateMinor }
}

/** A held booking that was never paid goes away, and its job can be booked again. */
export async function releaseUnpaidBooking(db: Knex, bookingId: number, reason: string): Promise<boolean> {
  return db.transaction(async (trx) => {
    const booking = await trx<PaidBooking>('bookings').where({ id: bookingId, status: 'held' }).first()
    if (!booking) return false
    const now = nowIso()
    // Conditional, so of two servers releasing the same hold at once only one goes on (the other finds it gone).
    const released = await trx('bookings').where({ id: bookingId, status: 'held' }).update({ status: 'cancelled', cancelled_at: now, cancel_reason: reason, ical_sequence: booking.ical_sequence + 1, updated_at: now })
    if (released !== 1) return false
    const job = booking.job_id ? await trx('jobs').where({ id: booking.job_id }).first('state') : null
    if (job?.state === 'booked') await transitionJob(trx, booking.job_id!, 'unbook', 'system', { comment: reason })
    return true
  })
}

/** Held bookings whose time to pay ran out: expire their sessions and free the slots. */
export async function releaseExpiredHolds(db: Knex): Promise<number> {
  const expired = await db<PaidBooking>('bookings').where({ status: 'held' }).where('hold_expires_at', '<=', nowIso())
  let released = 0
  for (const booking of expired) {
    if (booking.checkout_session_id) await useStripe().checkout.sessions.expire(booking.checkout_session_id).catch(() => undefined)
    if (await releaseUnpaidBooking(db, booking.id, 'Not paid in time')) released++
  }
  return released
}

/**
 * Brings the ledger in line with a PaymentIntent as Stripe reports it now. Every webhook ends here with
 * a freshly retrieved PaymentIntent, so duplicates and out-of-order events can't double-count.
 */
export async function syncPaymentIntent(
  db: Knex,
  intent: Stripe.PaymentIntent,
  receiptDetail?: string,
): Promise<{ booking: PaidBooking; newKinds: LedgerKind[] } | null> {
  const bookingId = Number(intent.metadata?.bookingId)
  const booking = Number.isInteger(bookingId) ? await db<PaidBooking>('bookings').where({ id: bookingId }).first() : undefined
  if (!booking) return null
  const currency = intent.currency.toUpperCase()
  const purpose = intent.metadata?.purpose ?? 'booking'
  const newKinds: LedgerKind[] = []
  const note = async (kind: LedgerKind, amountMinor: number, key: string, text = '') => {
    if (amountMinor > 0 && (await record(db, booking, { kind, amountMinor, currency, objectId: intent.id, key, note: text }, receiptDetail))) {
      newKinds.push(kind)
    }
  }
  if (purpose === 'balance') {
    if (intent.status === 'succeeded') await note('charged', intent.amount_received, `charge:${intent.id}`, 'Balance over the held amount')
    return { booking, newKinds }
  }
  if (!booking.payment_intent_id) await db('bookings').where({ id: booking.id }).update({ payment_intent_id: intent.id })
  const holdLapsed = booking.status === 'cancelled' || (booking.status === 'held' && !!booking.hold_expires_at && booking.hold_expires_at <= nowIso())
  if (intent.status === 'requires_capture' && holdLapsed) {
    // Paid for a slot that is gone (cancelled, or the time to pay ran out): give the hold back at once.
    const released = await useStripe().paymentIntents.cancel(intent.id, {}, { idempotencyKey: `cancel-${intent.id}` })
    if (booking.status === 'held') await releaseUnpaidBooking(db, booking.id, 'Not paid in time')
    return syncPaymentIntent(db, released)
  }
  const wasAuthorised = intent.status === 'requires_capture' || intent.status === 'succeeded' || (intent.status === 'canceled' && intent.amount_received > 0)
  if (wasAuthorised) await note('authorised', intent.amount, `auth:${intent.id}`)
  if (intent.status === 'succeeded') await note(booking.status === 'cancelled' ? 'fee' : 'captured', intent.amount_received, `capture:${intent.id}`)
  // A hold that never was (a declined card, an abandoned checkout) releases nothing.
  const heldBefore = await db('payment_ledger').where({ ledger_key: `auth:${intent.id}` }).first('id')
  if (intent.status === 'canceled' && heldBefore) await note('released', intent.amount - intent.amount_received, `release:${intent.id}`)
  if (intent.status === 'requires_capture' && booking.status === 'held') {
    // Through the booking transaction, so it takes the booking lock before the row, in the order a move takes them.
    await inBookingTransaction(db, booking.cutter_id, (trx) =>
      trx('bookings').where({ id: booking.id, status: 'held' }).update({ status: 'confirmed', hold_expires_at: null, updated_at: nowIso() }))
  }
  return { booking: (await db<PaidBooking>('bookings').where({ id: booking.id }).first())!, newKinds }
}

async function paidBooking(db: Knex, bookingId: number): Promise<PaidBooking & { payment_intent_id: string }> {
  const booking = await db<PaidBooking>('bookings').where({ id: bookingId }).first()
  if (!booking) throw new NotFound('No such booking.')
  if (!booking.payment_intent_id) throw new Conflict('This booking has no card payment to settle.')
  return booking as PaidBooking & { payment_intent_id: string }
}

export interface Settlement {
  bookingId: number
  memberId: number | null
  newKinds: LedgerKind[]
  chargeMinor: number
  capturedMinor: number
  balanceMinor: number
  balanceUrl: string | null
  actualMinutes: number
  estimateMinutes: number
}

export interface CutQuote {
  actualMinutes: number
  /** Cutting minutes rounded up to the increment, plus the setup. */
  billableMinutes: number
  setupMinutes: number
  chargeMinor: number
  authorisedMinor: number
  /** Taken from the hold now; the rest (balance) is asked for with a second checkout. */
  captureMinor: number
  balanceMinor: number
  currency: string
  estimateMinutes: number
  estimateMinor: number
}

/** What finishing with `actualMinutes` of cutting (without setup) charges: the finish form shows it, settleCut takes it. */
export async function quoteCut(db: Knex, bookingId: number, actualMinutes: number): Promise<CutQuote> {
  const booking = await paidBooking(db, bookingId)
  const job = (await db<JobRow>('jobs').where({ id: booking.job_id! }).first())!
  const { cutter, estimate } = await jobPrice(db, job)
  const price = priceCut({
    cutMinutes: actualMinutes,
    incrementMinutes: cutter.billingIncrementMinutes,
    setupMinutes: cutter.setupMinutes,
    ratePerMinuteMinor: cutter.pricePerMinuteMinor,
    sheetCount: estimate.sheetCount,
    sheetPriceMinor: estimate.sheetPriceMinor,
  })
  const authorisedMinor = booking.authorised_minor ?? 0
  const captureMinor = Math.min(price.totalPriceMinor, authorisedMinor)
  return {
    actualMinutes,
    billableMinutes: price.billableMinutes,
    setupMinutes: cutter.setupMinutes,
    chargeMinor: price.totalPriceMinor,
    authorisedMinor,
    captureMinor,
    balanceMinor: price.totalPriceMinor - captureMinor,
    currency: cutter.currency,
    estimateMinutes: estimate.billableMinutes,
    estimateMinor: booking.estimate_minor ?? estimate.totalPriceMinor,
  }
}

/**
 * After the cut: charge the minutes actually used (billed in increments) plus setup and sheets.
 * Never more than was authorised; a higher amount captures the hold and asks the member for the rest.
 */
export async function settleCut(db: Knex, bookingId: number, actualMinutes: number, confirmedChargeMinor?: number): Promise<Settlement> {
  const booking = await paidBooking(db, bookingId)
  const quote = await quoteCut(db, bookingId, actualMinutes)
  if (confirmedChargeMinor !== undefined && confirmedChargeMinor !== quote.chargeMinor) {
    throw new Conflict(`The charge is now ${formatMinor(quote.chargeMinor, quote.currency)}, not the ${formatMinor(confirmedChargeMinor, quote.currency)} confirmed. Check the minutes and confirm again; nothing was charged.`)
  }
  const { chargeMinor, currency } = quote
  const stripe = useStripe()
  // Stripe's own state first: a finish that captured and then lost its commit (a crash, a lost answer) is not
  // captured again (the capture's key would refuse other amounts); what it captured is reconciled with this charge.
  const current = await stripe.paymentIntents.retrieve(booking.payment_intent_id)
  const alreadyCaptured = current.status === 'succeeded'
  const intent = alreadyCaptured ? current : await stripe.paymentIntents.capture(booking.payment_intent_id, { amount_to_capture: quote.captureMinor }, { idempotencyKey: `capture-${booking.payment_intent_id}` })
  const detail = `${actualMinutes} machine minutes used (estimated ${quote.estimateMinutes}).`
  const synced = await syncPaymentIntent(db, intent, detail)
  const capturedMinor = intent.amount_received
  const newKinds = [...(synced?.newKinds ?? [])]
  if (capturedMinor > chargeMinor) {
    // The earlier capture was for more minutes than finally logged: the difference goes back to the card.
    const refund = await stripe.refunds.create({ payment_intent: intent.id, amount: capturedMinor - chargeMinor, metadata: { bookingId: String(booking.id) } }, { idempotencyKey: `recapture-refund-${intent.id}-${chargeMinor}` })
    if (await record(db, booking, { kind: 'refunded', amountMinor: refund.amount, currency, objectId: refund.id, key: `refund:${refund.id}`, note: `Finished with ${actualMinutes} min of cutting; the earlier capture was for more` }, detail)) newKinds.push('refunded')
  }
  const balanceMinor = Math.max(0, chargeMinor - capturedMinor)
  let balanceUrl: string | null = null
  if (balanceMinor > 0) {
    // The debt is on the ledger before any checkout exists, so it stays payable from "My payments" if Stripe fails now.
    await record(db, booking, { kind: 'owed', amountMinor: balanceMinor, currency, objectId: booking.payment_intent_id, key: `owed:${booking.id}`, note: `${actualMinutes} min of cutting; the hold covered ${formatMinor(capturedMinor, currency)}` })
    balanceUrl = await openBalanceCheckout(db, booking.id)
      .then((checkout) => checkout.url)
      .catch((error) => {
        console.error(`[payments] balance checkout for booking ${booking.id} not opened:`, (error as Error).message)
        return null
      })
  }
  return {
    bookingId: booking.id,
    memberId: booking.member_id,
    newKinds,
    chargeMinor,
    capturedMinor: Math.min(capturedMinor, chargeMinor),
    balanceMinor,
    balanceUrl,
    actualMinutes,
    estimateMinutes: quote.estimateMinutes,
  }
}

/**
 * A hosted checkout for what is still owed on a booking (a second payment, captured at once). An open session for
 * the same amount is reused; a completed one is synced first, so a member can't pay the same balance twice.
 */
export async function openBalanceCheckout(db: Knex, bookingId: number): Promise<{ url: string; balanceMinor: number; currency: string }> {
  const booking = await paidBooking(db, bookingId)
  const stripe = useStripe()
  const previous = booking.balance_checkout_session_id ? await stripe.checkout.sessions.retrieve(booking.balance_checkout_session_id) : null
  if (previous?.status === 'complete' && typeof previous.payment_intent === 'string') await syncPaymentIntent(db, await stripe.paymentIntents.retrieve(previous.payment_intent))
  const [owed] = await balancesOwed(db, { bookingId })
  if (!owed) throw new Conflict('Nothing is owed on this booking.')
  if (previous?.status === 'open' && previous.amount_total === owed.balanceMinor && previous.url) return { url: previous.url, ...owed }
  const job = await db('jobs').where({ id: booking.job_id }).first('title')
  const member = await db('users').where({ id: booking.member_id }).first('email')
  const session = await stripe.checkout.sessions.create(
    {
      mode: 'payment',
      line_items: [{ quantity: 1, price_data: { currency: owed.currency.toLowerCase(), unit_amount: owed.balanceMinor, product_data: { name: `${job?.title ?? 'Cut'}: minutes over the held amount` } } }],
      payment_intent_data: { metadata: { bookingId: String(booking.id), purpose: 'balance' } },
      metadata: { bookingId: String(booking.id), purpose: 'balance' },
      customer_email: member.email,
      success_url: `${serverConfig().appUrl}/payments?balance=${booking.id}`,
      cancel_url: `${serverConfig().appUrl}/payments`,
    },
    // One key per generation: two clicks at once get the same session.
    { idempotencyKey: `balance-${booking.id}-${previous?.id ?? 'first'}-${owed.balanceMinor}` },
  )
  await db('bookings').where({ id: booking.id }).update({ balance_checkout_session_id: session.id, balance_checkout_url: session.url, updated_at: nowIso() })
  return { url: session.url!, ...owed }
}

/** Cancellation money: free releases the hold; late captures the policy's fee of the estimate. */
export async function settleCancellation(db: Knex, bookingId: number, feePercent: number): Promise<{ feeMinor: number; newKinds: LedgerKind[] }> {
  const booking = await db<PaidBooking>('bookings').where({ id: bookingId }).first()
  if (!booking?.payment_intent_id) {
    if (booking?.checkout_session_id) await useStripe().checkout.sessions.expire(booking.checkout_session_id).catch(() => undefined)
    return { feeMinor: 0, newKinds: [] }
  }
  const stripe = useStripe()
  const feeMinor = feePercent > 0 ? Math.min(percentOf(booking.estimate_minor ?? 0, feePercent), booking.authorised_minor ?? 0) : 0
  const intent =
    feeMinor > 0
      ? await stripe.paymentIntents.capture(booking.payment_intent_id, { amount_to_capture: feeMinor }, { idempotencyKey: `fee-${booking.payment_intent_id}` })
      : await stripe.paymentIntents.cancel(booking.payment_intent_id, {}, { idempotencyKey: `cancel-${booking.payment_intent_id}` })
  // Recorded as a fee by its own key before the generic sync, which would call a capture on a live booking "captured".
  const feeKinds: LedgerKind[] = []
  if (feeMinor > 0 && intent.status === 'succeeded' && (await record(db, booking, { kind: 'fee', amountMinor: intent.amount_received, currency: intent.currency.toUpperCase(), objectId: intent.id, key: `capture:${intent.id}` }))) feeKinds.push('fee')
  const synced = await syncPaymentIntent(db, intent)
  return { feeMinor, newKinds: [...feeKinds, ...(synced?.newKinds ?? [])] }
}

/** Staff refunds after capture, in full or in part, with a reason on the ledger. */
export async function refundBooking(db: Knex, staff: SessionUser, bookingId: number, input: { amountMinor?: number; reason: string }): Promise<LedgerRow> {
  const booking = await paidBooking(db, bookingId)
  const { capturedMinor, refundedMinor } = paymentStateOf(await ledgerFor(db, bookingId))
  const refundable = capturedMinor - refundedMinor
  const amountMinor = input.amountMinor ?? refundable
  if (refundable <= 0) throw new Conflict('Nothing captured is left to refund on this booking.')
  if (amountMinor > refundable) throw new InvalidInput(`At most ${refundable} (minor units) can still be refunded.`, { fields: { amountMinor: `At most ${refundable}.` } })
  const refund = await useStripe().refunds.create(
    { payment_intent: booking.payment_intent_id, amount: amountMinor, metadata: { bookingId: String(bookingId), by: String(staff.id) } },
    { idempotencyKey: `refund-${bookingId}-${refundedMinor}-${amountMinor}` },
  )
  await record(db, booking, { kind: 'refunded', amountMinor: refund.amount, currency: refund.currency.toUpperCase(), objectId: refund.id, key: `refund:${refund.id}`, note: input.reason })
  return (await db<LedgerRow>('payment_ledger').where({ ledger_key: `refund:${refund.id}` }).first())!
}

/** A webhook event, verified by the route; the ledger (and its receipts) follow the PaymentIntent's state now. */
export async function handleStripeEvent(db: Knex, event: Stripe.Event): Promise<void> {
  await db('stripe_events').insert({ id: event.id, type: event.type }).onConflict('id').ignore()
  const object = event.data.object as { object: string; id: string; payment_intent?: string | Stripe.PaymentIntent | null }
  let intentId: string | null = null
  if (object.object === 'payment_intent') intentId = object.id
  else if (object.object === 'checkout.session' || object.object === 'charge') intentId = typeof object.payment_intent === 'string' ? object.payment_intent : (object.payment_intent?.id ?? null)
  if (!intentId) {
    // An expired or abandoned checkout: free the held slot.
    if (event.type === 'checkout.session.expired') {
      const booking = await db('bookings').where({ checkout_session_id: object.id }).first('id')
      if (booking) await releaseUnpaidBooking(db, booking.id, 'Not paid in time')
    }
    return
  }
  await syncPaymentIntent(db, await useStripe().paymentIntents.retrieve(intentId))
}
