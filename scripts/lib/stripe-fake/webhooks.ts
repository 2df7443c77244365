import { createHmac } from 'node:crypto'
import type { FakeEvent } from './objects'

/**
 * Stripe's documented signature scheme (webhooks docs, "Verify webhook signatures"): the header
 * `Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<raw body>" keyed with the endpoint secret>`.
 */
export function stripeSignatureHeader(payload: string, secret: string, timestampSeconds: number): string {
  const signature = createHmac('sha256', secret).update(`${timestampSeconds}.${payload}`, 'utf8').digest('hex')
  return `t=${timestampSeconds},v1=${signature}`
}

export interface WebhookEndpoint {
  url: string
  secret: string
  /** Waits before each retry of a failed delivery; Stripe retries for days, the fake for a few seconds by default. */
  retryDelaysMs?: number[]
}

export interface WebhookDelivery {
  eventId: string
  eventType: string
  attempts: number
  /** HTTP status of the last attempt, or the connection error's message. */
  lastResult: number | string
  delivered: boolean
}

const DEFAULT_RETRY_DELAYS_MS = [250, 1000, 4000]

function assertLoopback(url: string): void {
  const { hostname, protocol } = new URL(url)
  const loopback = hostname === 'localhost' || hostname === '[::1]' || /^127\.\d+\.\d+\.\d+$/.test(hostname)
  if (protocol !== 'http:' || !loopback) throw new Error(`The Stripe fake sends webhooks to http:// loopback addresses only, not ${url}`)
}

/** Posts each event to one endpoint, signed, retrying on a non-2xx answer or a connection error. */
export class WebhookSender {
  readonly deliveries: WebhookDelivery[] = []
  private readonly inFlight = new Set<Promise<void>>()
  private readonly retryTimers = new Set<NodeJS.Timeout>()
  private closed = false

  constructor(
    private readonly endpoint: WebhookEndpoint,
    private readonly nowSeconds: () => number,
  ) {
    assertLoopback(endpoint.url)
  }

  send(event: FakeEvent): void {
    const delivery: WebhookDelivery = { eventId: event.id, eventType: event.type, attempts: 0, lastResult: 'pending', delivered: false }
    this.deliveries.push(delivery)
    event.pending_webhooks = 1
    this.track(this.attempt(event, delivery))
  }

  /** Resolves once no delivery or retry is pending. */
  async settled(): Promise<void> {
    while (this.inFlight.size > 0) await Promise.all(this.inFlight)
  }

  close(): void {
    this.closed = true
    for (const timer of this.retryTimers) clearTimeout(timer)
    this.retryTimers.clear()
    this.inFlight.clear()
  }

  private track(work: Promise<void>): void {
    this.inFlight.add(work)
    void work.finally(() => this.inFlight.delete(work))
  }

  private async attempt(event: FakeEvent, delivery: WebhookDelivery): Promise<void> {
    if (this.closed) return
    delivery.attempts += 1
    const payload = JSON.stringify(event, null, 2)
    try {
      const response = await fetch(this.endpoint.url, {
        method: 'POST',
        headers: {
          'content-type': 'application/json; charset=utf-8',
          'stripe-signature': stripeSignatureHeader(payload, this.endpoint.secret, this.nowSeconds()),
          'user-agent': 'kerfbook-stripe-fake',
        },
        body: payload,
        signal: AbortSignal.timeout(10_000),
      })
      await response.body?.cancel()
      delivery.lastResult = response.status
      delivery.delivered = response.ok
    } catch (error) {
      delivery.lastResult = error instanceof Error ? error.message : String(error)
    }
    if (delivery.delivered) {
      event.pending_webhooks = 0
      return
    }
    const retryDelay = (this.endpoint.retryDelaysMs ?? DEFAULT_RETRY_DELAYS_MS)[delivery.attempts - 1]
    if (retryDelay === undefined || this.closed) return
    // Tracking the wait as well keeps settled() pending until the last retry has run.
    this.track(
      new Promise<void>((resolve) => {
        const timer = setTimeout(() => {
          this.retryTimers.delete(timer)
          void this.attempt(event, delivery).then(resolve)
        }, retryDelay)
        this.retryTimers.add(timer)
      }),
    )
  }
}
