// Every request body has a size limit by route (server/utils/body-limit.ts). A declared Content-Length
// over it is refused before a byte of the body is read; a body without one (chunked) is counted while it
// streams and refused the moment it passes the limit. Either way no handler ever holds more than the limit.
import { getRequestHeader } from 'h3'

const WITH_BODY = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])

export default defineEventHandler((event) => {
  if (!WITH_BODY.has(event.method)) return
  const limitBytes = bodyLimitBytes(event.path)
  const declared = getRequestHeader(event, 'content-length')
  if (declared !== undefined && Number(declared) > limitBytes) {
    dropRestOfBody(event)
    const error = bodyTooLarge(limitBytes)
    throw createError({ statusCode: 413, statusMessage: 'PayloadTooLarge', message: error.message })
  }
  event._requestBody = limitedBodyStream(event, limitBytes)
})
