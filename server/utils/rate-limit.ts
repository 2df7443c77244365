import { TooManyRequests } from './errors'

const WINDOW_MS = 60_000
const MESSAGE = 'Too many attempts. Please wait a minute and try again.'

// In-memory sliding window per key; enough for one server process. Keys expire with their last hit.
const hits = new Map<string, number[]>()

function recent(key: string, now: number): number[] {
  const times = (hits.get(key) ?? []).filter((t) => now - t < WINDOW_MS)
  if (times.length) hits.set(key, times)
  else hits.delete(key)
  return times
}

/** Throws TooManyRequests (with the seconds until a slot frees) when any key already has `limit` hits this minute. */
export function assertUnderRateLimit(keys: string[], limit: number, now = Date.now()): void {
  let retryAfterMs = 0
  for (const key of keys) {
    const times = recent(key, now)
    if (times.length >= limit) retryAfterMs = Math.max(retryAfterMs, WINDOW_MS - (now - times[times.length - limit]!))
  }
  if (retryAfterMs > 0) throw new TooManyRequests(MESSAGE, Math.ceil(retryAfterMs / 1000))
}

export function recordRateLimitHit(keys: string[], now = Date.now()): void {
  for (const key of keys) hits.set(key, [...recent(key, now), now])
}

/** Both at once, for actions where every attempt counts. */
export function hitRateLimit(keys: string[], limit: number, now = Date.now()): void {
  assertUnderRateLimit(keys, limit, now)
  recordRateLimitHit(keys, now)
}
