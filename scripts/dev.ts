// npm run dev: the app with demo data and its local services, on 127.0.0.1 only.
import { spawn } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { appendFileSync, existsSync, readFileSync } from 'node:fs'
import { migrateLatest, openDatabase, seedDemoIfEmpty } from '../db/index'
import { startSmtpSink } from './lib/smtp-sink'

const appPort = Number(process.env.PORT || 3000)

// nuxt-auth-utils seals the session cookie with NUXT_SESSION_PASSWORD; keep a development one in .env (git-ignored).
if (!existsSync('.env') || !readFileSync('.env', 'utf8').includes('NUXT_SESSION_PASSWORD=')) {
  appendFileSync('.env', `NUXT_SESSION_PASSWORD=${randomBytes(32).toString('hex')}\n`)
  console.log('Wrote a development NUXT_SESSION_PASSWORD to .env')
}

const db = openDatabase()
await migrateLatest(db)
if (await seedDemoIfEmpty(db)) console.log('Seeded the demo workshop (password for every demo account: kerfbook-demo).')
await db.destroy()

const sink = await startSmtpSink({ smtpPort: Number(process.env.DEV_SMTP_PORT || 1025), httpPort: Number(process.env.DEV_OUTBOX_PORT || 1080) })
console.log(`Mail sink: smtp://127.0.0.1:${sink.smtpPort} (read it at /staff/outbox)`)

const nuxt = spawn('npx', ['nuxt', 'dev', '--host', '127.0.0.1', '--port', String(appPort)], {
  stdio: 'inherit',
  env: {
    ...process.env,
    SMTP_URL: process.env.SMTP_URL || `smtp://127.0.0.1:${sink.smtpPort}`,
    OUTBOX_URL: `http://127.0.0.1:${sink.httpPort}`,
    APP_URL: process.env.APP_URL || `http://127.0.0.1:${appPort}`,
  },
})

function stop() {
  nuxt.kill('SIGTERM')
}
process.on('SIGINT', stop)
process.on('SIGTERM', stop)
nuxt.on('exit', async (code) => {
  await sink.close()
  process.exit(code ?? 0)
})
