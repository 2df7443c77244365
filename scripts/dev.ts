// npm run dev: the app with demo data and its local services, on 127.0.0.1 only.
import { spawn } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { appendFileSync, existsSync, readFileSync } from 'node:fs'
import { migrateLatest, openDatabase, seedDemoIfEmpty } from '../db/index'
import { startSmtpSink } from './lib/smtp-sink'
import { startStripeFake } from './lib/stripe-fake/index'

const appPort = Number(process.env.PORT || 3000)

// nuxt-auth-utils seals the session cookie with NUXT_SESSION_PASSWORD; keep a development one in .env (git-ignored).
if (!existsSync('.env') || !readFileSync('.env', 'utf8').includes('NUXT_SESSION_PASSWORD=')) {
  appendFileSync('.env', `NUXT_SESSION_PASSWORD=${randomBytes(32).toString('hex')}\n`)
  console.log('Wrote a development NUXT_SESSION_PASSWORD to .env')
}

const db = openDatabase()
await migrateLatest(db)
if (await seedDemoIfEmpty(db, { history: true })) console.log('Seeded the demo workshop (password for every demo account: kerfbook-demo).')
await db.destroy()

const sink = await startSmtpSink({ smtpPort: Number(process.env.DEV_SMTP_PORT || 1025), httpPort: Number(process.env.DEV_OUTBOX_PORT || 1080) })
console.log(`Mail sink: smtp://127.0.0.1:${sink.smtpPort} (read it at /admin/outbox as an admin)`)

// The local stand-in for Stripe's API and hosted checkout; real keys and STRIPE_API_BASE replace it.
const webhookSecret = process.env.STRIPE_WEBHOOK_SECRET || 'whsec_kerfbook_local'
const stripeFake = process.env.STRIPE_API_BASE
  ? null
  : await startStripeFake({ port: Number(process.env.DEV_STRIPE_PORT || 12111), webhook: { url: `http://127.0.0.1:${appPort}/api/webhooks/stripe`, secret: webhookSecret } })
if (stripeFake) console.log(`Stripe test fake: ${stripeFake.url} (cards: 4242 4242 4242 4242 pays, 4000 0000 0000 0002 is declined)`)

const nuxt = spawn('npx', ['nuxt', 'dev', '--host', '127.0.0.1', '--port', String(appPort)], {
  stdio: 'inherit',
  env: {
    ...process.env,
    SMTP_URL: process.env.SMTP_URL || `smtp://127.0.0.1:${sink.smtpPort}`,
    OUTBOX_URL: `http://127.0.0.1:${sink.httpPort}`,
    APP_URL: process.env.APP_URL || `http://127.0.0.1:${appPort}`,
    STRIPE_API_BASE: process.env.STRIPE_API_BASE || stripeFake!.url,
    STRIPE_WEBHOOK_SECRET: webhookSecret,
  },
})

function stop() {
  nuxt.kill('SIGTERM')
}
process.on('SIGINT', stop)
process.on('SIGTERM', stop)
nuxt.on('exit', async (code) => {
  await sink.close()
  await stripeFake?.close()
  process.exit(code ?? 0)
})
