import { TooManyRequests } from './errors'

const WINDOW_MS = 60_000

// In-memory sliding window per key; enough for one server process. Keys expire with their last hit.
const hits = new Map<string, number[]>()

/** Records one attempt for each key; throws TooManyRequests when any key is over `limit` per minute. */
export function hitRateLimit(keys: string[], limit: number, now = Date.now()): void {
  let retryAfterMs = 0
  for (const key of keys) {
    const recent = (hits.get(key) ?? []).filter((t) => now - t < WINDOW_MS)
    recent.push(now)
    hits.set(key, recent)
    if (recent.length > limit) retryAfterMs = Math.max(retryAfterMs, WINDOW_MS - (now - recent[recent.length - 1 - limit]!))
  }
  if (retryAfterMs > 0) {
    throw new TooManyRequests('Too many sign-in attempts. Please wait a minute and try again.', Math.ceil(retryAfterMs / 1000))
  }
  if (hits.size > 50_000) {
    for (const [key, times] of hits) if (now - times[times.length - 1]! >= WINDOW_MS) hits.delete(key)
  }
}
