import Stripe from 'stripe'

// The official SDK, pointed at STRIPE_API_BASE: the local fake in development and tests, Stripe itself
// in production. Switching is configuration only.
let client: Stripe | undefined

export interface StripeConfig {
  secretKey: string
  webhookSecret: string
  apiBase: string
}

export function stripeConfig(): StripeConfig {
  return {
    secretKey: process.env.STRIPE_SECRET_KEY || 'sk_test_kerfbook_local',
    webhookSecret: process.env.STRIPE_WEBHOOK_SECRET || 'whsec_kerfbook_local',
    apiBase: process.env.STRIPE_API_BASE || 'http://127.0.0.1:12111',
  }
}

export function useStripe(): Stripe {
  if (!client) {
    const { secretKey, apiBase } = stripeConfig()
    const base = new URL(apiBase)
    client = new Stripe(secretKey, {
      host: base.hostname,
      port: Number(base.port || (base.protocol === 'https:' ? 443 : 80)),
      protocol: base.protocol === 'https:' ? 'https' : 'http',
      maxNetworkRetries: 1,
      timeout: 15_000,
    })
  }
  return client
}
