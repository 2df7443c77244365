import { isDeepStrictEqual } from 'node:util'
import { idempotencyMismatch, invalidParam } from './errors'
import type { FormObject } from './form-body'

export interface SavedResponse {
  status: number
  /** Saved serialised, so a replay returns the response exactly as it was first sent. */
  body: string
  requestId: string
}

interface SavedRequest {
  endpoint: string
  params: FormObject
  response: SavedResponse
}

/**
 * Stripe's idempotency (API reference, "Idempotent requests"): the first response for a key is saved and
 * replayed for retries; reusing the key with another endpoint or other parameters is an idempotency_error.
 * Keys are scoped to the API key, as they are to an account on Stripe.
 */
export class IdempotencyStore {
  private readonly saved = new Map<string, SavedRequest>()

  private static slot(apiKey: string, idempotencyKey: string): string {
    // Idempotency keys are up to 255 characters long.
    if (idempotencyKey.length > 255) throw invalidParam('Idempotency keys can be at most 255 characters long.', 'Idempotency-Key')
    return `${apiKey}\u0000${idempotencyKey}`
  }

  /** The saved response for a retry, or undefined for a new key; throws for a key reused differently. */
  replay(apiKey: string, idempotencyKey: string, endpoint: string, params: FormObject): SavedResponse | undefined {
    const saved = this.saved.get(IdempotencyStore.slot(apiKey, idempotencyKey))
    if (!saved) return undefined
    // Parameters are compared as decoded values, so the order they were sent in does not matter.
    if (saved.endpoint !== endpoint || !isDeepStrictEqual(saved.params, params)) throw idempotencyMismatch(idempotencyKey)
    return saved.response
  }

  save(apiKey: string, idempotencyKey: string, endpoint: string, params: FormObject, response: SavedResponse): void {
    this.saved.set(IdempotencyStore.slot(apiKey, idempotencyKey), { endpoint, params, response })
  }
}
