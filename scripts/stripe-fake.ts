// npx tsx scripts/stripe-fake.ts --port 12111 [--webhook-url URL --webhook-secret whsec_...]
// Runs the local Stripe fake by hand, on 127.0.0.1 only, until Ctrl+C.
import { parseArgs } from 'node:util'
import { startStripeFake } from './lib/stripe-fake/index'

const { values } = parseArgs({
  options: {
    port: { type: 'string', default: '12111' },
    'public-url': { type: 'string' },
    'webhook-url': { type: 'string' },
    'webhook-secret': { type: 'string', default: process.env.STRIPE_WEBHOOK_SECRET },
  },
})

const webhookUrl = values['webhook-url']
const webhookSecret = values['webhook-secret']
if (webhookUrl && !webhookSecret) {
  console.error('--webhook-url needs --webhook-secret (or STRIPE_WEBHOOK_SECRET) to sign the events it sends.')
  process.exit(2)
}

const fake = await startStripeFake({
  port: Number(values.port),
  publicUrl: values['public-url'],
  webhook: webhookUrl && webhookSecret ? { url: webhookUrl, secret: webhookSecret } : undefined,
})
console.log(`Stripe fake listening on ${fake.url}`)
console.log(`Point the SDK at it: new Stripe('sk_test_...', { host: '127.0.0.1', port: ${fake.port}, protocol: 'http' })`)
console.log(webhookUrl ? `Sending signed events to ${webhookUrl}` : 'No webhook endpoint: read events with GET /v1/events.')

async function stop() {
  await fake.close()
  process.exit(0)
}
process.on('SIGINT', stop)
process.on('SIGTERM', stop)
