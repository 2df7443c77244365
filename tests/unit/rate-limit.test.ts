import { describe, expect, it } from 'vitest'
import { forwardedClient } from '../../server/utils/client-ip'
import { assertUnderRateLimit, MAX_KEYS, rateLimitCount, rateLimitKeyCount, recordRateLimitHit } from '../../server/utils/rate-limit'
import { TooManyRequests } from '../../server/utils/errors'
import { signInSlowDownMs } from '../../server/utils/sign-in-throttle'

describe('the rate limiter', () => {
  it('refuses the key at its limit within a minute and frees it after', () => {
    const now = 1_000_000
    for (let i = 0; i < 3; i++) recordRateLimitHit(['unit:a'], now + i)
    expect(() => assertUnderRateLimit(['unit:a'], 3, now + 10)).toThrow(TooManyRequests)
    expect(() => assertUnderRateLimit(['unit:a'], 4, now + 10)).not.toThrow()
    expect(() => assertUnderRateLimit(['unit:a'], 3, now + 60_001)).not.toThrow()
  })

  it('holds a bounded number of keys and hits however many it is given, dropping the least recently hit', () => {
    const now = 2_000_000
    recordRateLimitHit(['unit:oldest'], now)
    for (let i = 0; i < MAX_KEYS + 20_000; i++) recordRateLimitHit([`unit:rotating-${i}`], now)
    expect(rateLimitKeyCount()).toBeLessThanOrEqual(MAX_KEYS)
    expect(rateLimitCount('unit:oldest', now)).toBe(0)
    expect(rateLimitCount(`unit:rotating-${MAX_KEYS + 19_999}`, now)).toBe(1)
    for (let i = 0; i < 10_000; i++) recordRateLimitHit(['unit:busy'], now + i / 1000)
    expect(rateLimitCount('unit:busy', now + 10)).toBeLessThanOrEqual(64)
  })
})

describe('the client address behind trusted proxies', () => {
  it('takes the right-most entry the proxy wrote, not what the client put to its left', () => {
    expect(forwardedClient('203.0.113.9', 1)).toBe('203.0.113.9')
    expect(forwardedClient('1.2.3.4, 5.6.7.8, 203.0.113.9', 1)).toBe('203.0.113.9')
    expect(forwardedClient('1.2.3.4, 203.0.113.9, 10.0.0.2', 2)).toBe('203.0.113.9')
    expect(forwardedClient(['spoofed', '203.0.113.9'], 1)).toBe('203.0.113.9')
    expect(forwardedClient('203.0.113.9', 3)).toBe('203.0.113.9')
    expect(forwardedClient(undefined, 1)).toBeUndefined()
  })
})

describe('the sign-in slow-down of an account under attack', () => {
  it('waits nothing up to the limit, then longer with each failure, and never more than two seconds', () => {
    expect(signInSlowDownMs(10, 10)).toBe(0)
    expect(signInSlowDownMs(11, 10)).toBeGreaterThan(0)
    expect(signInSlowDownMs(15, 10)).toBeGreaterThan(signInSlowDownMs(11, 10))
    expect(signInSlowDownMs(10_000, 10)).toBe(2000)
  })
})
