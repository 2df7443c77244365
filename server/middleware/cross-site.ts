// Refuses state-changing requests that a browser says come from another site, so a page elsewhere
// cannot act with a member's session cookie (cross-site request forgery).
//
// A browser names the requester of every POST/PUT/PATCH/DELETE in Origin (and, in current browsers,
// Sec-Fetch-Site), and page scripts cannot remove either header. A request with neither comes from a
// program (curl, a test, a payment provider), which holds no member's cookie unless it was given one;
// the session cookie is also SameSite=Lax, so even a browser too old to send Origin leaves it off a
// cross-site POST. Letting header-less requests through is therefore safe.
import { createError, getRequestHeader, getRequestHost, type H3Event } from 'h3'

const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])
// Webhooks are called server to server and prove themselves with a signature, not a cookie.
const SIGNED_CALLBACKS = '/api/webhooks/'

// Hosts, not schemes, are compared: behind a TLS-terminating proxy the page is https while the
// request reaching Node is http, and that is still this application.
function originHost(origin: string): string | undefined {
  try {
    return new URL(origin).host
  } catch {
    return undefined
  }
}

/** Why the request counts as cross-site, or undefined when it does not. */
function crossSiteReason(event: H3Event): string | undefined {
  const fetchSite = getRequestHeader(event, 'sec-fetch-site')
  // same-site is a sibling host (another app on a subdomain), which is still not this application.
  if (fetchSite === 'cross-site' || fetchSite === 'same-site') return `the browser marked it ${fetchSite}`
  const origin = getRequestHeader(event, 'origin')
  if (origin === undefined) return undefined
  if (origin === 'null') return 'it came from an opaque origin'
  if (originHost(origin) !== getRequestHost(event, { xForwardedHost: serverConfig().trustProxy })) return `it came from ${origin}`
  return undefined
}

export default defineEventHandler((event) => {
  if (!STATE_CHANGING.has(event.method) || event.path.startsWith(SIGNED_CALLBACKS)) return
  const reason = crossSiteReason(event)
  if (!reason) return
  throw createError({
    statusCode: 403,
    statusMessage: 'CrossSiteRequest',
    message: `This request was refused because ${reason}: changes can only be made from Kerfbook's own pages.`,
  })
})
