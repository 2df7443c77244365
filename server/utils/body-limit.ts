import type { H3Event } from 'h3'
import { MAX_CUT_FILE_BYTES } from '#shared/schemas/analysis'
import { PayloadTooLarge } from './errors'

const KB = 1024
const MB = 1024 * KB

// Largest body each kind of route accepts, in bytes; the first match wins. A route that needs more
// gets its own line here. JSON bodies are small: the sign-in form is under half a kilobyte.
const BODY_LIMITS: [RegExp, number][] = [
  // A cut file plus the multipart framing and the few text fields beside it.
  [/^\/api\/analysis$|^\/api\/jobs\/[^/]+\/files(?:\/[^/]+\/revisions)?$/, MAX_CUT_FILE_BYTES + 64 * KB],
  // The reasons for a job's warning groups (shared/schemas/jobs.ts): 4 MB holds some 2000 reasons of the full 2000
  // characters; the schema's count allows more, but only short reasons come in such numbers.
  [/^\/api\/jobs\/[^/]+\/submit$/, 4 * MB],
  // Payment provider events are a few kilobytes; common practice, no source.
  [/^\/api\/webhooks\//, 256 * KB],
  [/^\/api\/auth\//, 8 * KB],
]
const DEFAULT_LIMIT_BYTES = 64 * KB

export function bodyLimitBytes(path: string): number {
  const pathname = path.split('?')[0]!.replace(/\/+$/, '') || '/'
  return BODY_LIMITS.find(([pattern]) => pattern.test(pathname))?.[1] ?? DEFAULT_LIMIT_BYTES
}

function sizeText(bytes: number): string {
  return bytes >= MB ? `${Math.round(bytes / MB)} MB` : `${Math.round(bytes / KB)} KB`
}

export function bodyTooLarge(limitBytes: number): PayloadTooLarge {
  return new PayloadTooLarge(`The request is larger than the ${sizeText(limitBytes)} this address accepts.`)
}

/** The error to throw when reading the body failed: 413 if the limit stopped it, else undefined. */
export function bodyLimitError(event: H3Event): PayloadTooLarge | undefined {
  const limit = event.context.bodyLimitExceeded as number | undefined
  return limit ? bodyTooLarge(limit) : undefined
}

/**
 * After a 413 the rest of the body is read and dropped for a moment, so the client (still sending) sees
 * the answer rather than a reset connection, and then the connection is closed.
 */
export function dropRestOfBody(event: H3Event): void {
  const { req, res } = event.node
  req.removeAllListeners('data')
  req.on('data', () => undefined)
  req.resume()
  res.once('finish', () => {
    if (!req.complete) setTimeout(() => !req.complete && req.socket?.destroy(), 2000).unref()
  })
}

/**
 * The request body as a stream that stops at `limitBytes`: past it the stream fails with 413, the rest
 * is dropped and the connection closes shortly after the answer. Nothing is read until a handler asks.
 */
export function limitedBodyStream(event: H3Event, limitBytes: number): ReadableStream<Uint8Array> {
  const request = event.node.req
  let receivedBytes = 0
  let listening = false
  let finished = false
  return new ReadableStream<Uint8Array>(
    {
      pull(controller) {
        if (!listening) {
          listening = true
          request.on('data', (chunk: Buffer) => {
            if (finished) return
            receivedBytes += chunk.length
            if (receivedBytes > limitBytes) {
              finished = true
              event.context.bodyLimitExceeded = limitBytes
              dropRestOfBody(event)
              controller.error(bodyTooLarge(limitBytes))
              return
            }
            controller.enqueue(new Uint8Array(chunk.buffer, chunk.byteOffset, chunk.length))
            // One chunk at a time: the next is read when the handler pulls again.
            request.pause()
          })
          request.on('end', () => {
            if (finished) return
            finished = true
            controller.close()
          })
          request.on('error', (error) => {
            if (finished) return
            finished = true
            controller.error(error)
          })
        }
        request.resume()
      },
      cancel() {
        finished = true
        request.pause()
      },
    },
    { highWaterMark: 0 },
  )
}
