// Sign-in throttling that can't lock an owner out. Only failed attempts count, so people signing in
// behind one shared address are never refused for succeeding. An address is refused after too many
// failures on one account (SIGN_IN_LIMIT_PER_MINUTE) or on all accounts together (three times that);
// the account itself is never refused: when it is failing from many addresses, every attempt on it is
// slowed down instead, so the owner with the right password still gets in from anywhere.

const ADDRESS_FACTOR = 3
const SLOW_DOWN_STEP_MS = 100
const SLOW_DOWN_MAX_MS = 2000

const addressKey = (ip: string) => `sign-in-fail-ip:${ip}`
const pairKey = (ip: string, email: string) => `sign-in-fail:${ip}:${email}`
const accountKey = (email: string) => `sign-in-fail-account:${email}`

/** The wait before an attempt on an account with `failures` recent failures from anywhere. */
export function signInSlowDownMs(failures: number, limit: number): number {
  return Math.min(Math.max(0, failures - limit) * SLOW_DOWN_STEP_MS, SLOW_DOWN_MAX_MS)
}

/** Refuses (429) an address that failed too often; slows down attempts on an account under attack. */
export async function beforeSignInAttempt(ip: string, email: string): Promise<void> {
  const limit = serverConfig().signInLimitPerMinute
  assertUnderRateLimit([pairKey(ip, email)], limit)
  assertUnderRateLimit([addressKey(ip)], limit * ADDRESS_FACTOR)
  const waitMs = signInSlowDownMs(rateLimitCount(accountKey(email)), limit)
  if (waitMs > 0) await new Promise((resolve) => setTimeout(resolve, waitMs))
}

export function recordSignInFailure(ip: string, email: string): void {
  recordRateLimitHit([addressKey(ip), pairKey(ip, email), accountKey(email)])
}

/** The right password from an address forgives that address's failures on the account. */
export function recordSignInSuccess(ip: string, email: string): void {
  clearRateLimit([pairKey(ip, email)])
}
