import { getRequestIP, type H3Event } from 'h3'

/** The caller's address; X-Forwarded-For is believed only behind a trusted proxy (TRUST_PROXY=1). */
export function clientIp(event: H3Event): string {
  return getRequestIP(event, { xForwardedFor: serverConfig().trustProxy }) ?? 'unknown'
}
