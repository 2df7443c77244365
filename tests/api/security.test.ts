// The session cookie's flags, refusal of cross-site changes, and the security headers of pages and API.
import { createHash } from 'node:crypto'
import { readdirSync, readFileSync } from 'node:fs'
import { describe, expect, inject, it } from 'vitest'
import { DEMO_PASSWORD, signedIn } from './helpers'

const baseUrl = () => inject('baseUrl')
const signInBody = JSON.stringify({ email: 'member@example.test', password: DEMO_PASSWORD })

function signIn(headers: Record<string, string> = {}) {
  return fetch(`${baseUrl()}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-forwarded-for': '10.251.0.1', ...headers },
    body: signInBody,
  })
}

function cookieAttributes(setCookie: string): Set<string> {
  return new Set(setCookie.split(';').slice(1).map((part) => part.trim().toLowerCase()))
}

describe('the session cookie', () => {
  it.each([
    ['over plain http on loopback', {}],
    ['behind an https proxy', { 'x-forwarded-proto': 'https' }],
  ])('is HttpOnly, SameSite=Lax or Strict and Secure %s', async (_, headers) => {
    const response = await signIn(headers)
    expect(response.status).toBe(200)
    const session = response.headers.getSetCookie().find((c) => c.startsWith('nuxt-session='))
    expect(session, 'a session cookie').toBeDefined()
    const attributes = cookieAttributes(session!)
    expect(attributes.has('httponly')).toBe(true)
    expect(attributes.has('samesite=lax') || attributes.has('samesite=strict')).toBe(true)
    // Browsers keep Secure cookies on http://127.0.0.1 and localhost, so Secure costs nothing in development.
    expect(attributes.has('secure')).toBe(true)
  })
})

describe('cross-site requests', () => {
  /** A member's job creation — a plain state change — with the member's cookie, as a forged form would send it. */
  async function changeAttempt(headers: Record<string, string>) {
    const cookie = (await signIn()).headers.getSetCookie()[0]!.split(';')[0]!
    return fetch(`${baseUrl()}/api/jobs`, { method: 'POST', headers: { 'content-type': 'application/json', ...headers, cookie }, body: '{}' })
  }

  it.each([
    ['an Origin of another site', { origin: 'https://evil.example' }],
    ['a null Origin', { origin: 'null' }],
    ['Sec-Fetch-Site: cross-site', { 'sec-fetch-site': 'cross-site' }],
    ['Sec-Fetch-Site: same-site', { 'sec-fetch-site': 'same-site' }],
  ])('refuses a change with %s, saying why', async (_, headers) => {
    const response = await changeAttempt(headers)
    expect(response.status).toBe(403)
    expect(((await response.json()) as { message: string }).message).toMatch(/changes can only be made from Kerfbook's own pages/)
  })

  it.each(['PUT', 'PATCH', 'DELETE'])('refuses a cross-site %s before the route runs', async (method) => {
    const response = await fetch(`${baseUrl()}/api/me/calendar-feed`, { method, headers: { origin: 'https://evil.example' } })
    expect(response.status).toBe(403)
  })

  it.each([
    ['its own Origin', () => ({ origin: baseUrl(), 'sec-fetch-site': 'same-origin' })],
    ['no Origin, as a program sends it', () => ({})],
  ])('lets a change with %s through to the route', async (_, headers) => {
    const response = await changeAttempt(headers())
    // The empty body fails validation: the request reached the route.
    expect(response.status).toBe(400)
  })

  it('keeps cross-site reads working: the calendar feed and sign-in page answer a link from elsewhere', async () => {
    const member = await signedIn('member@example.test')
    const { url } = (await member.post('/api/me/calendar-feed')).body as { url: string }
    const feed = await fetch(`${baseUrl()}${new URL(url).pathname}`, { headers: { origin: 'https://calendar.example', 'sec-fetch-site': 'cross-site' } })
    expect(feed.status).toBe(200)
    expect(await feed.text()).toContain('BEGIN:VCALENDAR')
  })

  it('leaves signed webhooks under /api/webhooks/ to their own signature check', async () => {
    const response = await fetch(`${baseUrl()}/api/webhooks/anything`, { method: 'POST', headers: { origin: 'https://payments.example', 'sec-fetch-site': 'cross-site' } })
    expect(response.status).not.toBe(403)
  })
})

describe('security headers', () => {
  function scriptHashes(html: string): string[] {
    return [...html.matchAll(/<script((?:\s+[^>]*)?)>([\s\S]*?)<\/script>/gi)]
      .filter(([, attributes = '', body = '']) => body.length > 0 && !/src=|application\/json/.test(attributes))
      .map(([, , body]) => `'sha256-${createHash('sha256').update(body!).digest('base64')}'`)
  }

  it('gives pages a policy that allows exactly their own inline scripts and nothing inline besides', async () => {
    const response = await fetch(`${baseUrl()}/sign-in`)
    const html = await response.text()
    const policy = response.headers.get('content-security-policy') ?? ''
    const directives = new Map(policy.split(';').map((d) => d.trim().split(/\s+/)).map(([name, ...values]) => [name!, values]))
    const scriptSources = directives.get('script-src') ?? []
    expect(scriptSources).toContain("'self'")
    expect(scriptSources).not.toContain("'unsafe-inline'")
    expect(scriptSources).not.toContain("'unsafe-eval'")
    const hashes = scriptHashes(html)
    expect(hashes.length).toBeGreaterThan(0)
    expect(scriptSources.filter((s) => s.startsWith("'sha256-")).sort()).toEqual(hashes.sort())
    expect(directives.get('object-src')).toEqual(["'none'"])
    expect(directives.get('frame-ancestors')).toEqual(["'none'"])
    expect(directives.get('base-uri')).toEqual(["'self'"])
  })

  // Error answers of the API come from Nitro's error handler, which sends its own stricter set
  // (Referrer-Policy no-referrer, script-src 'none'); both keep scripts, framing and sniffing out.
  it.each([
    ['a page', '/sign-in', false],
    ['a missing page', '/no-such-page', false],
    ['an API answer', '/api/catalog/overview', true],
    ['an API refusal', '/api/me', false],
  ])('sends nosniff, no framing, a referrer policy and a script-blocking policy on %s', async (_, path, asMember) => {
    const member = await signedIn('member@example.test')
    const response = asMember ? await member.get(path) : { headers: (await fetch(`${baseUrl()}${path}`)).headers }
    const { headers } = response
    expect(headers.get('x-content-type-options')).toBe('nosniff')
    expect(headers.get('x-frame-options')).toBe('DENY')
    expect(['strict-origin-when-cross-origin', 'no-referrer']).toContain(headers.get('referrer-policy'))
    const policy = headers.get('content-security-policy') ?? ''
    expect(policy).toMatch(/frame-ancestors 'none'/)
    if (path.startsWith('/api')) expect(policy).toMatch(/(?:default|script)-src 'none'/)
  })
})

describe('development helpers', () => {
  it('has no dev outbox in a production build, even for an admin and with OUTBOX_URL set', async () => {
    const admin = await signedIn('admin@example.test')
    const staff = await signedIn('staff@example.test')
    expect((await admin.get('/api/dev/outbox')).status).toBe(404)
    expect((await staff.get('/api/dev/outbox')).status).toBe(404)
    expect((await fetch(`${baseUrl()}/api/dev/outbox`)).status).toBe(404)
    // Not a route that refuses: no route at all. The built server's route table does not name it.
    const chunks = readdirSync('.output/server/chunks', { recursive: true, encoding: 'utf8' }).filter((file) => file.endsWith('.mjs'))
    const routeTable = chunks.map((file) => readFileSync(`.output/server/chunks/${file}`, 'utf8')).find((text) => /route:\s*["']\/api\/me["']/.test(text))
    expect(routeTable).toBeDefined()
    expect(routeTable).not.toMatch(/route:\s*["']\/api\/dev\//)
  })
})
