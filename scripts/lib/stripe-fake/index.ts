import { randomBytes } from 'node:crypto'
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http'
import type { AddressInfo } from 'node:net'
import { chargeRoutes } from './api/charges'
import { checkoutSessionRoutes } from './api/checkout-sessions'
import { eventRoutes } from './api/events'
import { paymentIntentRoutes } from './api/payment-intents'
import { refundRoutes } from './api/refunds'
import { authenticate } from './auth'
import { handleCheckoutPage } from './checkout-routes'
import { invalidParam, StripeFakeError, unknownRoute } from './errors'
import { decodeStripeForm, MalformedFormKey, type FormObject } from './form-body'
import { IdempotencyStore, type SavedResponse } from './idempotency'
import { expireOverdueSessions } from './payment-flow'
import { matchRoute, type Route } from './router'
import { StripeFakeState } from './store'
import { WebhookSender, type WebhookDelivery, type WebhookEndpoint } from './webhooks'

export { stripeSignatureHeader } from './webhooks'

export interface StripeFakeOptions {
  /** 0 (the default) picks a free port. */
  port?: number
  /** Base address put into Checkout Session `url`s; defaults to http://127.0.0.1:<port>. */
  publicUrl?: string
  /** Where to POST signed events; a loopback http:// address. */
  webhook?: WebhookEndpoint
  /** Milliseconds since the epoch; tests pass their own clock to move past expiry times. */
  clock?: () => number
}

export interface StripeFake {
  port: number
  url: string
  state: StripeFakeState
  /** Every webhook delivery so far, with attempts and last result. */
  webhookDeliveries: WebhookDelivery[]
  /** Resolves once every webhook delivery (and retry) has finished. */
  webhooksSettled(): Promise<void>
  close(): Promise<void>
}

const MAX_BODY_BYTES = 1024 * 1024
// Open sessions past expires_at are expired this often, so checkout.session.expired arrives without a request.
const EXPIRY_SWEEP_MS = 1000

async function readBody(request: IncomingMessage): Promise<string> {
  const chunks: Buffer[] = []
  let size = 0
  for await (const chunk of request) {
    size += (chunk as Buffer).length
    if (size > MAX_BODY_BYTES) throw invalidParam('Request body too large.', 'body')
    chunks.push(chunk as Buffer)
  }
  return Buffer.concat(chunks).toString('utf8')
}

function decodeParams(text: string): FormObject {
  try {
    return decodeStripeForm(text)
  } catch (error) {
    if (error instanceof MalformedFormKey) throw invalidParam(error.message, error.key)
    throw error
  }
}

function errorResponse(error: StripeFakeError, requestId: string): SavedResponse {
  return { status: error.statusCode, body: JSON.stringify({ error: error.body }, null, 2), requestId }
}

/** Runs one /v1 API request: authenticate, decode, replay or run, and save for its Idempotency-Key. */
function handleApiRequest(
  routes: Route[],
  idempotency: IdempotencyStore,
  request: IncomingMessage,
  url: URL,
  body: string,
): { response: SavedResponse; replayed: boolean } {
  const requestId = `req_${randomBytes(8).toString('hex')}`
  const method = request.method ?? 'GET'
  const idempotencyKey = method === 'POST' ? (request.headers['idempotency-key'] as string | undefined) : undefined
  try {
    const apiKey = authenticate(request.headers.authorization)
    const params = decodeParams(method === 'POST' ? body : url.search.slice(1))
    const matched = matchRoute(routes, method, url.pathname)
    if (!matched) throw unknownRoute(method, url.pathname)
    const endpoint = `${method} ${url.pathname}`
    const saved = idempotencyKey ? idempotency.replay(apiKey, idempotencyKey, endpoint, params) : undefined
    if (saved) return { response: saved, replayed: true }
    let response: SavedResponse
    let savable = true
    try {
      const result = matched.route.handler({ pathParams: matched.pathParams, params, context: { requestId, idempotencyKey: idempotencyKey ?? null } })
      response = { status: 200, body: JSON.stringify(result, null, 2), requestId }
    } catch (error) {
      if (!(error instanceof StripeFakeError)) throw error
      response = errorResponse(error, requestId)
      savable = !error.failedValidation
    }
    if (idempotencyKey && savable) idempotency.save(apiKey, idempotencyKey, endpoint, params, response)
    return { response, replayed: false }
  } catch (error) {
    if (error instanceof StripeFakeError) return { response: errorResponse(error, requestId), replayed: false }
    console.error('[stripe-fake]', error)
    const internal = new StripeFakeError(500, { type: 'api_error', message: 'The Stripe fake failed to handle this request; see its log.' })
    return { response: errorResponse(internal, requestId), replayed: false }
  }
}

function send(response: ServerResponse, status: number, headers: Record<string, string>, body: string): void {
  response.writeHead(status, headers)
  response.end(body)
}

/** Starts the local fake of Stripe's HTTP API and hosted checkout on 127.0.0.1. */
export async function startStripeFake(options: StripeFakeOptions = {}): Promise<StripeFake> {
  const clock = options.clock ?? Date.now
  const state = new StripeFakeState(clock)
  const webhookSender = options.webhook ? new WebhookSender(options.webhook, () => state.nowSeconds()) : undefined
  if (webhookSender) state.onEvent((event) => webhookSender.send(event))
  const idempotency = new IdempotencyStore()
  let routes: Route[] = []

  const server = createServer((request, response) => {
    const url = new URL(request.url ?? '/', 'http://127.0.0.1')
    readBody(request)
      .then((body) => {
        expireOverdueSessions(state)
        if (url.pathname.startsWith('/v1/')) {
          const { response: answer, replayed } = handleApiRequest(routes, idempotency, request, url, body)
          const headers: Record<string, string> = { 'content-type': 'application/json', 'request-id': answer.requestId }
          if (replayed) Object.assign(headers, { 'idempotent-replayed': 'true', 'original-request': answer.requestId })
          send(response, answer.status, headers, answer.body)
        } else if (url.pathname.startsWith('/checkout/')) {
          const page = handleCheckoutPage(state, request.method ?? 'GET', url.pathname, body)
          send(response, page.status, page.headers, page.body)
        } else {
          send(response, 404, { 'content-type': 'text/plain; charset=utf-8' }, 'Not found: the Stripe fake serves /v1/… and /checkout/… only.\n')
        }
      })
      .catch((error: unknown) => {
        const body = error instanceof StripeFakeError ? JSON.stringify({ error: error.body }) : JSON.stringify({ error: { type: 'api_error', message: String(error) } })
        send(response, error instanceof StripeFakeError ? error.statusCode : 500, { 'content-type': 'application/json' }, body)
      })
  })

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(options.port ?? 0, '127.0.0.1', () => resolve())
  })
  const port = (server.address() as AddressInfo).port
  const url = `http://127.0.0.1:${port}`
  const publicUrl = (options.publicUrl ?? url).replace(/\/$/, '')
  routes = [...checkoutSessionRoutes(state, publicUrl), ...paymentIntentRoutes(state), ...chargeRoutes(state), ...refundRoutes(state), ...eventRoutes(state)]
  const sweep = setInterval(() => expireOverdueSessions(state), EXPIRY_SWEEP_MS)
  sweep.unref()

  return {
    port,
    url,
    state,
    webhookDeliveries: webhookSender?.deliveries ?? [],
    webhooksSettled: () => webhookSender?.settled() ?? Promise.resolve(),
    close: async () => {
      clearInterval(sweep)
      webhookSender?.close()
      server.closeAllConnections()
      await new Promise<void>((resolve) => server.close(() => resolve()))
    },
  }
}
