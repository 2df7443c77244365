import { describe, expect, it } from 'vitest'
import { client, DEMO_PASSWORD, linkToken, sqlRows, uniqueEmail, waitForMail } from './helpers'

/** A new account, signed up and verified through its e-mail link. */
async function verifiedAccount(prefix: string, password: string): Promise<string> {
  const email = uniqueEmail(prefix)
  await client().post('/api/auth/sign-up', { name: prefix, email, password })
  expect((await client().post('/api/auth/verify', { token: linkToken(await waitForMail(email, /Confirm your e-mail/), '/verify') })).status).toBe(200)
  return email
}

describe('sign-up, verification, sign-in, sign-out', () => {
  it('sends a verification mail that really arrives, and its link verifies the account', async () => {
    const visitor = client()
    const email = uniqueEmail('newcomer')
    const signUp = await visitor.post('/api/auth/sign-up', { name: 'Ottoline Fenwick', email, password: 'long-enough-pass' })
    expect(signUp.status).toBe(201)

    // Before verification the password is right but the account can't sign in yet.
    const early = await client().post('/api/auth/sign-in', { email, password: 'long-enough-pass' })
    expect(early.status).toBe(403)

    const mail = await waitForMail(email, /Confirm your e-mail/)
    expect(mail.html).toContain('/verify?token=')
    const token = linkToken(mail, '/verify')

    const verified = await visitor.post('/api/auth/verify', { token })
    expect(verified.status).toBe(200)
    expect(verified.body).toMatchObject({ email, role: 'member' })
    expect((await visitor.get('/api/me')).body).toMatchObject({ email })

    // The link is single-use.
    expect((await client().post('/api/auth/verify', { token })).status).toBe(400)

    const member = client()
    const signIn = await member.post('/api/auth/sign-in', { email, password: 'long-enough-pass' })
    expect(signIn.status).toBe(200)
    expect(member.hasCookie()).toBe(true)
    expect((await member.get('/api/me')).status).toBe(200)

    expect((await member.post('/api/auth/sign-out')).status).toBe(200)
    expect((await member.get('/api/me')).status).toBe(401)
  })

  it('answers a sign-up for a taken address exactly as for a new one, and mails the owner instead', async () => {
    const newEmail = uniqueEmail('fresh')
    const fresh = await client().post('/api/auth/sign-up', { name: 'Fresh', email: newEmail, password: 'long-enough-pass' })
    const taken = await client().post('/api/auth/sign-up', { name: 'Copy', email: 'PRIYA@example.test', password: 'an-attackers-pass' })
    expect(taken.status).toBe(fresh.status)
    expect(taken.status).toBe(201)
    expect(taken.body.message.replace('priya@example.test', '<address>')).toBe(fresh.body.message.replace(newEmail, '<address>'))
    expect(Object.keys(taken.body).sort()).toEqual(Object.keys(fresh.body).sort())

    const notice = await waitForMail('priya@example.test', /Someone tried to sign up with your address/)
    expect(notice.text).toContain('/sign-in')
    // Nothing about the existing account changed.
    expect((await client().post('/api/auth/sign-in', { email: 'priya@example.test', password: DEMO_PASSWORD })).status).toBe(200)
    expect((await client().post('/api/auth/sign-in', { email: 'priya@example.test', password: 'an-attackers-pass' })).status).toBe(401)
  })

  it('limits sign-ups: ten a minute from one address, three a minute to one recipient', async () => {
    const sameAddress = client('192.0.2.88')
    const statuses: number[] = []
    for (let i = 0; i < 11; i++) statuses.push((await sameAddress.post('/api/auth/sign-up', { name: 'Burst', email: uniqueEmail('burst'), password: 'long-enough-pass' })).status)
    expect(statuses.slice(0, 10).every((s) => s === 201)).toBe(true)
    expect(statuses[10]).toBe(429)

    const target = uniqueEmail('mail-bombed')
    const toOne: number[] = []
    for (let i = 0; i < 4; i++) toOne.push((await client().post('/api/auth/sign-up', { name: 'Bomb', email: target, password: 'long-enough-pass' })).status)
    expect(toOne).toEqual([201, 201, 201, 429])
  })
})

describe('credentials and rate limits', () => {
  it('gives the same 401 message for a wrong password and an unknown e-mail', async () => {
    const wrongPassword = await client().post('/api/auth/sign-in', { email: 'member@example.test', password: 'not-the-password' })
    const unknownEmail = await client().post('/api/auth/sign-in', { email: uniqueEmail('nobody'), password: 'not-the-password' })
    expect(wrongPassword.status).toBe(401)
    expect(unknownEmail.status).toBe(401)
    expect(wrongPassword.body.message).toBe(unknownEmail.body.message)
  })

  // SIGN_IN_LIMIT_PER_MINUTE is 10 in the test server: 10 failures per address and account, 30 per address.
  it('refuses an attacker hammering an account from one address, while the owner signs in from another', async () => {
    const email = await verifiedAccount('hammered', 'kerfbook-demo-2')
    const attacker = client('192.0.2.10')
    const statuses: number[] = []
    for (let i = 0; i < 12; i++) statuses.push((await attacker.post('/api/auth/sign-in', { email, password: 'wrong-password' })).status)
    expect(statuses.slice(0, 10).every((s) => s === 401)).toBe(true)
    expect(statuses.slice(10)).toEqual([429, 429])
    // The attacker is refused even with the right password now: the limit is checked before the password.
    const blocked = await attacker.post('/api/auth/sign-in', { email, password: 'kerfbook-demo-2' })
    expect(blocked.status).toBe(429)
    expect(Number(blocked.headers.get('retry-after'))).toBeGreaterThan(0)

    const owner = client('198.51.100.20')
    expect((await owner.post('/api/auth/sign-in', { email, password: 'kerfbook-demo-2' })).status).toBe(200)
    expect((await owner.get('/api/me')).body).toMatchObject({ email })
  })

  it('lets the owner in while the account fails from many addresses at once (slowed, never locked)', async () => {
    const email = await verifiedAccount('besieged', 'kerfbook-demo-3')
    const attempts = Array.from({ length: 40 }, (_, i) => client(`192.0.2.${100 + (i % 20)}`).post('/api/auth/sign-in', { email, password: `guess-${i}` }))
    const statuses = (await Promise.all(attempts)).map((r) => r.status)
    expect(statuses.every((s) => s === 401 || s === 429)).toBe(true)
    const owner = client('198.51.100.21')
    expect((await owner.post('/api/auth/sign-in', { email, password: 'kerfbook-demo-3' })).status).toBe(200)
  })

  it('does not let a rotating X-Forwarded-For get around the limit: the proxy’s right-most entry is the address', async () => {
    const email = await verifiedAccount('rotated', 'kerfbook-demo-4')
    const statuses: number[] = []
    for (let i = 0; i < 12; i++) {
      const spoofed = client(`10.${i}.${i}.${i}, 192.0.2.33`)
      statuses.push((await spoofed.post('/api/auth/sign-in', { email, password: 'wrong-password' })).status)
    }
    expect(statuses.slice(0, 10).every((s) => s === 401)).toBe(true)
    expect(statuses.slice(10)).toEqual([429, 429])
  })

  it('never refuses people signing in successfully behind one shared address', async () => {
    // More successes than the address may fail (30): a success that counted would be refused here.
    const school = '192.0.2.44'
    const statuses: number[] = []
    for (let batch = 0; batch < 4; batch++) {
      const signIns = Array.from({ length: 8 }, () => client(school).post('/api/auth/sign-in', { email: 'member@example.test', password: DEMO_PASSWORD }))
      statuses.push(...(await Promise.all(signIns)).map((r) => r.status))
    }
    expect(statuses).toHaveLength(32)
    expect(statuses.every((s) => s === 200)).toBe(true)
  })

  it('limits one address trying many e-mails to 30 failures a minute', async () => {
    const sameAddress = client('192.0.2.77')
    const statuses: number[] = []
    for (let i = 0; i < 31; i++) statuses.push((await sameAddress.post('/api/auth/sign-in', { email: uniqueEmail('probe'), password: 'x' })).status)
    expect(statuses.slice(0, 30).every((s) => s === 401)).toBe(true)
    expect(statuses[30]).toBe(429)
  })
})

describe('password reset', () => {
  it('sends a one-time link; it works once and the new password signs in', async () => {
    const email = await verifiedAccount('forgetful', 'first-password-1')
    const asked = await client().post('/api/auth/forgot-password', { email })
    expect(asked.status).toBe(200)
    const token = linkToken(await waitForMail(email, /Reset your password/), '/reset-password')

    expect((await client().post('/api/auth/reset-password', { token, password: 'a-brand-new-secret' })).status).toBe(200)
    expect((await client().post('/api/auth/reset-password', { token, password: 'a-second-new-secret' })).status).toBe(400)
    expect((await client().post('/api/auth/sign-in', { email, password: 'a-brand-new-secret' })).status).toBe(200)
    expect((await client().post('/api/auth/sign-in', { email, password: 'first-password-1' })).status).toBe(401)
  })

  it('answers the same for an unknown address and sends nothing', async () => {
    const email = uniqueEmail('ghost')
    const known = await client().post('/api/auth/forgot-password', { email: await verifiedAccount('known', 'first-password-1') })
    const unknown = await client().post('/api/auth/forgot-password', { email })
    expect(unknown.status).toBe(known.status)
    await expect(waitForMail(email, /Reset/, 500)).rejects.toThrow()
  })

  it('refuses an expired link', async () => {
    const email = await verifiedAccount('late-reader', 'first-password-1')
    await client().post('/api/auth/forgot-password', { email })
    const mail = await waitForMail(email, /Reset your password/)
    const token = linkToken(mail, '/reset-password')
    // Age the stored token past its expiry directly in the database.
    await sqlRows("update auth_tokens set expires_at = '2000-01-01T00:00:00.000Z' where purpose = 'reset-password' and used_at is null")
    const response = await client().post('/api/auth/reset-password', { token, password: 'another-new-secret' })
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(/expired/)
  })
})

describe('change password', () => {
  it('needs the current password', async () => {
    const email = uniqueEmail('changer')
    const visitor = client()
    await visitor.post('/api/auth/sign-up', { name: 'Changer', email, password: 'first-password-1' })
    await visitor.post('/api/auth/verify', { token: linkToken(await waitForMail(email, /Confirm/), '/verify') })
    const wrong = await visitor.post('/api/me/password', { currentPassword: 'nope', newPassword: 'second-password-2' })
    expect(wrong.status).toBe(400)
    expect(wrong.body.data.fields.currentPassword).toBeTruthy()
    expect((await visitor.post('/api/me/password', { currentPassword: 'first-password-1', newPassword: 'second-password-2' })).status).toBe(200)
    expect((await client().post('/api/auth/sign-in', { email, password: 'second-password-2' })).status).toBe(200)
  })
})
