import { randomInt } from 'node:crypto'
import { resourceMissing } from './errors'
import Stripe from 'stripe'
import type { FakeCard, FakeCharge, FakeCheckoutSession, FakeEvent, FakeLineItem, FakePaymentIntent, FakeRefund } from './objects'

/** What the API call or page action that caused an event tells Stripe's `event.request`. */
export interface RequestContext {
  requestId: string | null
  idempotencyKey: string | null
}

export const CUSTOMER_ACTION: RequestContext = { requestId: null, idempotencyKey: null }

/** A Checkout Session with what only the fake needs to know to run its payment page. */
export interface StoredCheckoutSession {
  session: FakeCheckoutSession
  lineItems: FakeLineItem[]
  paymentIntentData: {
    captureMethod: FakePaymentIntent['capture_method']
    metadata: Record<string, string>
    description: string | null
  }
  /** The card (and payer's e-mail) waiting for the payer to confirm or refuse the authentication step. */
  awaitingAuthentication: { card: FakeCard; email: string } | null
}

const ID_ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789'

/** Everything the fake knows, in memory, for one running instance. */
export class StripeFakeState {
  readonly checkoutSessions = new Map<string, StoredCheckoutSession>()
  readonly paymentIntents = new Map<string, FakePaymentIntent>()
  readonly charges = new Map<string, FakeCharge>()
  readonly refunds = new Map<string, FakeRefund>()
  /** In the order they happened; the Events API lists them newest first. */
  readonly events = new Map<string, FakeEvent>()
  private readonly eventListeners: ((event: FakeEvent) => void)[] = []

  constructor(private readonly clockMs: () => number) {}

  /** Stripe timestamps are Unix seconds. */
  nowSeconds(): number {
    return Math.floor(this.clockMs() / 1000)
  }

  newId(prefix: string, length = 24): string {
    let random = ''
    for (let i = 0; i < length; i++) random += ID_ALPHABET[randomInt(ID_ALPHABET.length)]
    return `${prefix}${random}`
  }

  onEvent(listener: (event: FakeEvent) => void): void {
    this.eventListeners.push(listener)
  }

  /** Records an event carrying a snapshot of the object as it is now, as Stripe's events do. */
  recordEvent(type: string, object: object, context: RequestContext): FakeEvent {
    const event: FakeEvent = {
      id: this.newId('evt_'),
      object: 'event',
      // Events are rendered in the API version of the SDK the project pins.
      api_version: Stripe.API_VERSION,
      created: this.nowSeconds(),
      data: { object: structuredClone(object) },
      livemode: false,
      pending_webhooks: 0,
      request: { id: context.requestId, idempotency_key: context.idempotencyKey },
      type,
    }
    this.events.set(event.id, event)
    for (const listener of this.eventListeners) listener(event)
    return event
  }
}

/** The stored object, or the 404 resource_missing error Stripe gives for an unknown id. */
export function findOrThrow<Stored>(objects: Map<string, Stored>, id: string, objectName: string, param: string): Stored {
  const stored = objects.get(id)
  if (!stored) throw resourceMissing(objectName, id, param)
  return stored
}
