import type { H3Event } from 'h3'

/**
 * The caller's address. Without a trusted proxy it is the connection's address. Behind TRUST_PROXY=N
 * proxies it is the N-th address from the right of X-Forwarded-For: each proxy appends the address it
 * was called from, so the right-most entries are written by our proxies and everything to their left
 * is whatever the client chose to send.
 */
export function clientIp(event: H3Event): string {
  const hops = serverConfig().trustedProxyHops
  const socketAddress = event.node.req.socket.remoteAddress ?? 'unknown'
  if (hops === 0) return socketAddress
  return forwardedClient(event.node.req.headers['x-forwarded-for'], hops) ?? socketAddress
}

export function forwardedClient(header: string | string[] | undefined, hops: number): string | undefined {
  const entries = (Array.isArray(header) ? header.join(',') : (header ?? ''))
    .split(',')
    .map((entry) => entry.trim())
    .filter(Boolean)
  if (entries.length === 0) return undefined
  return entries[Math.max(0, entries.length - hops)]
}
