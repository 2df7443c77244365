// Server settings from the environment, read once. README lists each variable.
export interface ServerConfig {
  appUrl: string
  smtpUrl: string
  mailFrom: string
  outboxUrl: string
  trustProxy: boolean
  signInLimitPerMinute: number
}

let cached: ServerConfig | undefined

export function serverConfig(): ServerConfig {
  cached ??= {
    appUrl: (process.env.APP_URL || 'http://127.0.0.1:3000').replace(/\/$/, ''),
    smtpUrl: process.env.SMTP_URL || 'smtp://127.0.0.1:1025',
    mailFrom: process.env.MAIL_FROM || 'Kerfbook <desk@example.test>',
    outboxUrl: process.env.OUTBOX_URL || '',
    trustProxy: process.env.TRUST_PROXY === '1',
    signInLimitPerMinute: Number(process.env.SIGN_IN_LIMIT_PER_MINUTE || 10),
  }
  return cached
}
