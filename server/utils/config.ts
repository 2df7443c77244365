// Server settings from the environment, read once. README lists each variable.
export interface ServerConfig {
  appUrl: string
  smtpUrl: string
  mailFrom: string
  outboxUrl: string
  /** Behind a proxy: the proxy's forwarded host and scheme are believed. */
  trustProxy: boolean
  /** How many proxies of our own stand in front (TRUST_PROXY=N; 0: none). */
  trustedProxyHops: number
  signInLimitPerMinute: number
}

let cached: ServerConfig | undefined

export function serverConfig(): ServerConfig {
  cached ??= {
    appUrl: (process.env.APP_URL || 'http://127.0.0.1:3000').replace(/\/$/, ''),
    smtpUrl: process.env.SMTP_URL || 'smtp://127.0.0.1:1025',
    mailFrom: process.env.MAIL_FROM || 'Kerfbook <desk@example.test>',
    outboxUrl: process.env.OUTBOX_URL || '',
    trustProxy: trustedProxyHops() > 0,
    trustedProxyHops: trustedProxyHops(),
    signInLimitPerMinute: Number(process.env.SIGN_IN_LIMIT_PER_MINUTE || 10),
  }
  return cached
}

function trustedProxyHops(): number {
  const hops = Number(process.env.TRUST_PROXY || 0)
  return Number.isInteger(hops) && hops > 0 ? hops : 0
}
