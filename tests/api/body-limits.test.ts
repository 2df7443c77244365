// Oversized bodies are refused with 413 before they are read, by declared size and while streaming,
// and the server keeps answering everyone else meanwhile.
import { request as httpRequest, type ClientRequest } from 'node:http'
import { describe, expect, inject, it } from 'vitest'
import { client, DEMO_PASSWORD, signedIn } from './helpers'

const MB = 1024 * 1024

interface Outcome {
  status: number
  /** Bytes of the body written when the answer arrived. */
  sentBytes: number
  body: string
  request: ClientRequest
  /** Bytes of the body written when the connection closed (a client that keeps sending after the answer). */
  closed: Promise<number>
  stillOpen: () => boolean
}

interface PostOptions {
  chunked?: boolean
  contentType?: string
  cookie?: string
  /** A hostile client: it goes on sending after the answer, until the server closes the connection. */
  keepSending?: boolean
  /** Only the headers: no byte of the body is sent, so an answer proves the body was never waited for. */
  headersOnly?: boolean
  /** Sends `totalBytes` and then neither more nor the body's end, so an answer proves the end was never waited for. */
  neverEnd?: boolean
}

/**
 * Sends a body of `totalBytes` in paced 64 KB chunks, declared by Content-Length or chunked, and resolves as soon
 * as the answer arrives, without waiting for the body to be sent. The caller ends the request.
 */
function oversizedPost(
  path: string,
  totalBytes: number,
  { chunked = false, contentType = 'application/json', cookie = '', keepSending = false, headersOnly = false, neverEnd = false }: PostOptions = {},
): Promise<Outcome> {
  const url = new URL(path, inject('baseUrl'))
  return new Promise((resolve, reject) => {
    const headers: Record<string, string> = { 'content-type': contentType, 'x-forwarded-for': '10.250.0.1' }
    if (!chunked) headers['content-length'] = String(totalBytes)
    if (cookie) headers.cookie = cookie
    const request = httpRequest(url, { method: 'POST', headers })
    let sentBytes = 0
    let answered = false
    let open = true
    const stillOpen = () => open
    const closed = new Promise<number>((resolveClosed) =>
      request.on('close', () => {
        open = false
        resolveClosed(sentBytes)
      }),
    )
    const chunk = Buffer.alloc(64 * 1024, 0x20)
    // The server closes the connection after its 413; writes after that fail, which is expected.
    request.on('error', (error) => {
      if (!answered) reject(error)
    })
    request.on('response', (response) => {
      answered = true
      let body = ''
      response.setEncoding('utf8')
      response.on('data', (text) => (body += text))
      response.on('end', () => resolve({ status: response.statusCode!, sentBytes, body, request, closed, stillOpen }))
      response.on('error', () => resolve({ status: response.statusCode!, sentBytes, body, request, closed, stillOpen }))
    })
    const writeMore = () => {
      if ((answered && !keepSending) || request.destroyed) return
      if (sentBytes >= totalBytes) return void (neverEnd || request.end())
      sentBytes += chunk.length
      // Paced (64 KB a millisecond at most), so an answer that waited for the whole body would show.
      if (request.write(chunk)) setTimeout(writeMore, 1)
      else request.once('drain', writeMore)
    }
    if (headersOnly) return void request.flushHeaders()
    request.write('{"email":"')
    writeMore()
  })
}

describe('body limits', () => {
  it('refuses four 256 MB sign-ins by Content-Length before reading them, and answers others while they keep sending', async () => {
    // The answer comes before a byte of the body is sent: the declared size alone decides.
    const unsent = await oversizedPost('/api/auth/sign-in', 256 * MB, { headersOnly: true })
    unsent.request.destroy()
    expect(unsent.status).toBe(413)
    expect(unsent.sentBytes).toBe(0)

    // Four hostile clients that go on sending after their 413.
    const member = await signedIn('member@example.test')
    const outcomes = await Promise.all(Array.from({ length: 4 }, () => oversizedPost('/api/auth/sign-in', 256 * MB, { keepSending: true })))
    for (const outcome of outcomes) {
      expect(outcome.status).toBe(413)
      expect(JSON.parse(outcome.body).message).toMatch(/larger than the 8 KB/)
    }
    expect((await member.get('/api/me')).status).toBe(200)
    expect((await client().get('/api/me')).status).toBe(401)
    // Those answers came while the bodies were still streaming in.
    expect(outcomes.filter((o) => o.stillOpen()).length).toBeGreaterThan(0)
    // The server drops what keeps coming and then closes each connection, long before 256 MB.
    for (const bytesWhenClosed of await Promise.all(outcomes.map((o) => o.closed))) expect(bytesWhenClosed).toBeLessThan(256 * MB)
  })

  it.each([
    ['sign-in', '/api/auth/sign-in'],
    ['sign-up', '/api/auth/sign-up'],
    ['the payment webhook', '/api/webhooks/stripe'],
  ])('refuses a chunked body without Content-Length to %s as soon as it passes the limit', async (_, path) => {
    // The body never ends: any answer at all shows the server refused it once it passed the limit, without waiting
    // for the end (how many bytes went out before the answer depends only on how busy the machine is).
    const outcome = await oversizedPost(path, 16 * MB, { chunked: true, neverEnd: true })
    outcome.request.destroy()
    expect(outcome.status).toBe(413)
  })

  it.each([
    ['the upload route past the file limit, by Content-Length', '/api/analysis', 64 * MB, 'multipart/form-data; boundary=x', false],
    ['a JSON route past 64 KB, chunked', '/api/jobs', 64 * MB, 'application/json', true],
  ])('refuses a signed-in member’s body to %s with 413', async (_, path, total, contentType, chunked) => {
    const signIn = await fetch(`${inject('baseUrl')}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-forwarded-for': '10.250.0.2' },
      body: JSON.stringify({ email: 'member@example.test', password: DEMO_PASSWORD }),
    })
    const cookie = signIn.headers.getSetCookie()[0]!.split(';')[0]!
    const outcome = await oversizedPost(path, total, { chunked, contentType, cookie })
    outcome.request.destroy()
    expect(outcome.status).toBe(413)
    expect(outcome.sentBytes).toBeLessThan(total)
  })

  it('still takes a body just under a route’s limit', async () => {
    const response = await client().post('/api/auth/sign-in', { email: 'member@example.test', password: 'x'.repeat(150), padding: ' '.repeat(7000) })
    expect(response.status).toBe(401)
  })
})
