import { describe, expect, it } from 'vitest'
import { NEW_PASSWORD_HINT, newPasswordField } from '../../shared/schemas/auth'

// The hint the account forms show states the rule the server checks: one number serves both.
describe('the new-password rule', () => {
  const shortest = Number(/At least (\d+) characters/.exec(NEW_PASSWORD_HINT)?.[1])

  it('names a length in the hint', () => {
    expect(shortest).toBeGreaterThan(0)
  })

  it('accepts a password exactly as long as the hint says and refuses one character less', () => {
    expect(newPasswordField.safeParse('p'.repeat(shortest)).success).toBe(true)
    const tooShort = newPasswordField.safeParse('p'.repeat(shortest - 1))
    expect(tooShort.success).toBe(false)
    expect(tooShort.error?.issues[0]?.message).toBe(`Use at least ${shortest} characters.`)
  })
})
