import { invalidApiKey } from './errors'

// Test-mode secret keys only: the fake must never look like it accepts a live key.
const TEST_SECRET_KEY = /^sk_test_[A-Za-z0-9_]+$/

function redact(key: string): string {
  return key.length > 12 ? `${key.slice(0, 8)}${'*'.repeat(key.length - 12)}${key.slice(-4)}` : key
}

/**
 * Reads the API key the way Stripe accepts it (API reference, "Authentication"): a bearer token,
 * or HTTP basic auth with the key as user name and no password. Returns the key or throws 401.
 */
export function authenticate(authorization: string | undefined): string {
  if (!authorization) {
    throw invalidApiKey('You did not provide an API key. Provide your test secret key (sk_test_...) as a bearer token or as the basic-auth user name.')
  }
  const [scheme = '', credentials = ''] = authorization.split(' ', 2)
  const key =
    scheme.toLowerCase() === 'basic' ? Buffer.from(credentials, 'base64').toString('utf8').split(':')[0]! : scheme.toLowerCase() === 'bearer' ? credentials : ''
  if (!TEST_SECRET_KEY.test(key)) throw invalidApiKey(`Invalid API Key provided: ${redact(key)}. This local fake accepts test secret keys (sk_test_...) only.`)
  return key
}
