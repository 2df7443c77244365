import { gunzipSync } from 'node:zlib'
import { getRequestHeader, setResponseHeaders, setResponseStatus, type H3Event } from 'h3'

/**
 * Sends stored gzip-compressed bytes that never change (a revision's packed geometry or sites): as they
 * are, with Content-Encoding gzip, to every client that accepts it; a matching If-None-Match gets 304.
 * The browser keeps them for a year, privately, as their URL names one revision.
 */
export function sendImmutablePacked(event: H3Event, payload: { gzipped: Buffer; etag: string }): Buffer | null {
  setResponseHeaders(event, {
    'Content-Type': 'application/octet-stream',
    'Cache-Control': 'private, max-age=31536000, immutable',
    ETag: payload.etag,
    Vary: 'Accept-Encoding',
  })
  if (getRequestHeader(event, 'if-none-match') === payload.etag) {
    setResponseStatus(event, 304)
    return null
  }
  if (/\bgzip\b/.test(getRequestHeader(event, 'accept-encoding') ?? '')) {
    setResponseHeaders(event, { 'Content-Encoding': 'gzip' })
    return payload.gzipped
  }
  return gunzipSync(payload.gzipped)
}
