// Sessions really end: a copy of the cookie is refused after sign-out, sign-out everywhere, a password
// change or a reset, and reset links die when the password changes.
import { describe, expect, inject, it } from 'vitest'
import { client, linkToken, uniqueEmail, waitForMail } from './helpers'

const baseUrl = () => inject('baseUrl')
let addressCounter = 0

/** Signs in and returns the bare session cookie, as an intruder who copied it would hold it. */
async function cookieFor(email: string, password: string): Promise<string> {
  const response = await fetch(`${baseUrl()}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-forwarded-for': `10.249.0.${++addressCounter}` },
    body: JSON.stringify({ email, password }),
  })
  expect(response.status).toBe(200)
  return response.headers.getSetCookie()[0]!.split(';')[0]!
}

function withCookie(cookie: string, path: string, method = 'GET', body?: unknown) {
  return fetch(`${baseUrl()}${path}`, {
    method,
    headers: { cookie, 'content-type': 'application/json', 'x-forwarded-for': '10.249.1.1' },
    body: body === undefined ? undefined : JSON.stringify(body),
  })
}

async function accountWith(password: string): Promise<string> {
  const email = uniqueEmail('sessions')
  await client().post('/api/auth/sign-up', { name: 'Session Tester', email, password })
  expect((await client().post('/api/auth/verify', { token: linkToken(await waitForMail(email, /Confirm your e-mail/), '/verify') })).status).toBe(200)
  return email
}

describe('sessions that end', () => {
  it('refuses a replayed cookie after sign-out, on the API and on the session endpoint', async () => {
    const email = await accountWith('first-password-1')
    const cookie = await cookieFor(email, 'first-password-1')
    const other = await cookieFor(email, 'first-password-1')
    expect((await withCookie(cookie, '/api/me')).status).toBe(200)
    expect((await withCookie(cookie, '/api/auth/sign-out', 'POST', {})).status).toBe(200)
    expect((await withCookie(cookie, '/api/me')).status).toBe(401)
    expect((await withCookie(cookie, '/api/_auth/session')).status).toBe(401)
    // Signing out here leaves the account's other browser signed in.
    expect((await withCookie(other, '/api/me')).status).toBe(200)
  })

  it('ends the other sessions and every reset link on a password change, and keeps the one that changed it', async () => {
    const email = await accountWith('first-password-1')
    const owner = await cookieFor(email, 'first-password-1')
    const intruder = await cookieFor(email, 'first-password-1')
    await client().post('/api/auth/forgot-password', { email })
    const token = linkToken(await waitForMail(email, /Reset your password/), '/reset-password')

    const changed = await withCookie(owner, '/api/me/password', 'POST', { currentPassword: 'first-password-1', newPassword: 'second-password-2' })
    expect(changed.status).toBe(200)
    expect((await withCookie(owner, '/api/me')).status).toBe(200)
    expect((await withCookie(intruder, '/api/me')).status).toBe(401)
    const reset = await client().post('/api/auth/reset-password', { token, password: 'intruders-password' })
    expect(reset.status).toBe(400)
    expect((await client().post('/api/auth/sign-in', { email, password: 'second-password-2' })).status).toBe(200)
    // The owner hears of it, in case it was not them.
    expect((await waitForMail(email, /Your password was changed/)).text).toContain('reset it now')
  })

  it('ends every session on a password reset', async () => {
    const email = await accountWith('first-password-1')
    const intruder = await cookieFor(email, 'first-password-1')
    await client().post('/api/auth/forgot-password', { email })
    const token = linkToken(await waitForMail(email, /Reset your password/), '/reset-password')
    expect((await client().post('/api/auth/reset-password', { token, password: 'a-brand-new-secret' })).status).toBe(200)
    expect((await withCookie(intruder, '/api/me')).status).toBe(401)
    await waitForMail(email, /Your password was changed/)
  })

  it('signs out everywhere from the account page’s action', async () => {
    const email = await accountWith('first-password-1')
    const here = await cookieFor(email, 'first-password-1')
    const phone = await cookieFor(email, 'first-password-1')
    const laptop = await cookieFor(email, 'first-password-1')
    const someoneElse = await cookieFor('member@example.test', 'kerfbook-demo')
    expect((await withCookie(here, '/api/me/sign-out-everywhere', 'POST', {})).status).toBe(200)
    for (const cookie of [here, phone, laptop]) expect((await withCookie(cookie, '/api/me')).status).toBe(401)
    expect((await withCookie(someoneElse, '/api/me')).status).toBe(200)
    expect((await client().post('/api/auth/sign-in', { email, password: 'first-password-1' })).status).toBe(200)
  })
})
