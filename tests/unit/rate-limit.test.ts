import { describe, expect, it } from 'vitest'
import { forwardedClient } from '../../server/utils/client-ip'
import { assertUnderRateLimit, MAX_HITS, MAX_HITS_PER_KEY, MAX_KEYS, rateLimitCount, rateLimitSize, recordRateLimitHit, sweepRateLimits } from '../../server/utils/rate-limit'
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

  it('holds a bounded number of keys and times however many it is given, dropping the least recently hit', () => {
    const now = 2_000_000
    recordRateLimitHit(['unit:oldest'], now)
    for (let i = 0; i < MAX_KEYS + 20_000; i++) recordRateLimitHit([`unit:rotating-${i}`], now)
    expect(rateLimitSize().keys).toBeLessThanOrEqual(MAX_KEYS)
    expect(rateLimitCount('unit:oldest', now)).toBe(0)
    expect(rateLimitCount(`unit:rotating-${MAX_KEYS + 19_999}`, now)).toBe(1)
    // A key hammered without end keeps its newest times only, and they stay countable.
    for (let i = 0; i < MAX_HITS_PER_KEY + 500; i++) recordRateLimitHit(['unit:busy-999'], now + i / 1_000_000)
    expect(rateLimitCount('unit:busy-999', now + 10)).toBe(MAX_HITS_PER_KEY)
    // Many keys hammered: the times in all are bounded too.
    const keys = Math.ceil((1.2 * MAX_HITS) / MAX_HITS_PER_KEY)
    for (let i = 0; i < keys * MAX_HITS_PER_KEY; i++) recordRateLimitHit([`unit:busy-${i % keys}`], now + 1 + i / 10_000_000)
    expect(rateLimitSize().hits).toBeLessThanOrEqual(MAX_HITS)
    // A limit above what a key keeps is enforced as that many, never not at all.
    for (let i = 0; i < MAX_HITS_PER_KEY; i++) recordRateLimitHit(['unit:capped'], now + 2 + i / 1_000_000)
    expect(() => assertUnderRateLimit(['unit:capped'], 5000, now + 10)).toThrow(TooManyRequests)
  })

  it('keeps its count of stored times right as times age out and keys are cleared', () => {
    const now = 9_000_000
    sweepRateLimits(now)
    const before = rateLimitSize().hits
    recordRateLimitHit(['unit:aging', 'unit:aging-2'], now)
    expect(rateLimitSize().hits).toBe(before + 2)
    expect(rateLimitCount('unit:aging', now + 60_001)).toBe(0)
    expect(rateLimitSize().hits).toBe(before + 1)
  })
})

describe('the rate limiter after an attack', () => {
  it('gives the memory of a burst of keys back a minute after their last hit, with the next hit', () => {
    const now = 20_000_000
    for (let i = 0; i < 20_000; i++) recordRateLimitHit([`unit:burst-${i}`, `unit:burst-pair-${i}`], now + i / 1000)
    expect(rateLimitSize().keys).toBeGreaterThanOrEqual(40_000)
    // Still inside the minute of the newest ones: only the keys whose last hit is a minute old are gone.
    recordRateLimitHit(['unit:meanwhile'], now + 60_000 + 10)
    expect(rateLimitSize().keys).toBe(2 * (20_000 - 10_001) + 1)
    expect(rateLimitCount('unit:burst-19999', now + 60_000 + 10)).toBe(1)
    recordRateLimitHit(['unit:next-minute'], now + 2 * 60_000 + 20)
    expect(rateLimitSize()).toEqual({ keys: 1, hits: 1 })
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
