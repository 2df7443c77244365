import { TooManyRequests } from './errors'

const WINDOW_MS = 60_000
const MESSAGE = 'Too many attempts. Please wait a minute and try again.'
// However many addresses and accounts are tried, the limiter holds at most MAX_KEYS keys and MAX_HITS
// times in all (some 20 MB at worst); when full, the keys hit least recently go first. Every hit also sweeps out
// the keys whose last hit is a minute old, so the store shrinks back once an attack stops. A key keeps its
// newest MAX_HITS_PER_KEY times, so a higher limit is enforced as that many.
export const MAX_KEYS = 50_000
export const MAX_HITS = 500_000
export const MAX_HITS_PER_KEY = 1000

// In-memory sliding window per key; enough for one server process. A Map keeps insertion order, and a key
// is moved to the end on every hit, so the first key is always the one hit least recently.
const hits = new Map<string, number[]>()
let storedHits = 0

function forget(key: string): void {
  storedHits -= hits.get(key)?.length ?? 0
  hits.delete(key)
}

/** The key's times in the last minute, oldest first; older ones are dropped from the store. */
function recent(key: string, now: number): number[] {
  const times = hits.get(key)
  if (!times) return []
  let expired = 0
  while (expired < times.length && now - times[expired]! >= WINDOW_MS) expired++
  if (expired > 0) {
    times.splice(0, expired)
    storedHits -= expired
    if (times.length === 0) hits.delete(key)
  }
  return times
}

/** Hits of `key` in the last minute. */
export function rateLimitCount(key: string, now = Date.now()): number {
  return recent(key, now).length
}

/** Throws TooManyRequests (with the seconds until a slot frees) when any key already has `limit` hits this minute. */
export function assertUnderRateLimit(keys: string[], requestedLimit: number, now = Date.now()): void {
  const limit = Math.min(requestedLimit, MAX_HITS_PER_KEY)
  let retryAfterMs = 0
  for (const key of keys) {
    const times = recent(key, now)
    if (times.length >= limit) retryAfterMs = Math.max(retryAfterMs, WINDOW_MS - (now - times[times.length - limit]!))
  }
  if (retryAfterMs > 0) throw new TooManyRequests(MESSAGE, Math.ceil(retryAfterMs / 1000))
}

/**
 * Forgets every key whose newest hit is a minute old. The map is in order of last hit, so the sweep walks from the
 * front and stops at the first key still counting: after a burst of many keys the memory goes back with the next hit.
 */
export function sweepRateLimits(now = Date.now()): void {
  for (const [key, times] of hits) {
    if (now - times[times.length - 1]! < WINDOW_MS) return
    forget(key)
  }
}

export function recordRateLimitHit(keys: string[], now = Date.now()): void {
  sweepRateLimits(now)
  for (const key of keys) {
    const times = recent(key, now)
    hits.delete(key)
    times.push(now)
    storedHits++
    if (times.length > MAX_HITS_PER_KEY) {
      times.shift()
      storedHits--
    }
    hits.set(key, times)
  }
  while (hits.size > MAX_KEYS || storedHits > MAX_HITS) forget(hits.keys().next().value!)
}

/** Both at once, for actions where every attempt counts. */
export function hitRateLimit(keys: string[], limit: number, now = Date.now()): void {
  assertUnderRateLimit(keys, limit, now)
  recordRateLimitHit(keys, now)
}

export function clearRateLimit(keys: string[]): void {
  for (const key of keys) forget(key)
}

/** How many keys and times the limiter holds, for tests of its bound. */
export function rateLimitSize(): { keys: number; hits: number } {
  return { keys: hits.size, hits: storedHits }
}
