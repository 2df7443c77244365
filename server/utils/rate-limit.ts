import { TooManyRequests } from './errors'

const WINDOW_MS = 60_000
const MESSAGE = 'Too many attempts. Please wait a minute and try again.'
// However many addresses and accounts are tried, the limiter holds at most this many keys, each with at
// most MAX_HITS_PER_KEY times: some megabytes at worst. When full, the key hit least recently goes.
export const MAX_KEYS = 50_000
const MAX_HITS_PER_KEY = 64

// In-memory sliding window per key; enough for one server process. A Map keeps insertion order, and a key
// is moved to the end on every hit, so the first key is always the one hit least recently.
const hits = new Map<string, number[]>()

function recent(key: string, now: number): number[] {
  const times = (hits.get(key) ?? []).filter((t) => now - t < WINDOW_MS)
  if (times.length === 0) hits.delete(key)
  return times
}

/** Hits of `key` in the last minute. */
export function rateLimitCount(key: string, now = Date.now()): number {
  return recent(key, now).length
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
  for (const key of keys) {
    const times = [...recent(key, now), now].slice(-MAX_HITS_PER_KEY)
    hits.delete(key)
    hits.set(key, times)
  }
  while (hits.size > MAX_KEYS) hits.delete(hits.keys().next().value!)
}

/** Both at once, for actions where every attempt counts. */
export function hitRateLimit(keys: string[], limit: number, now = Date.now()): void {
  assertUnderRateLimit(keys, limit, now)
  recordRateLimitHit(keys, now)
}

export function clearRateLimit(keys: string[]): void {
  for (const key of keys) hits.delete(key)
}

/** How many keys the limiter holds, for tests of its bound. */
export function rateLimitKeyCount(): number {
  return hits.size
}
