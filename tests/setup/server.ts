// Vitest global setup for the API project: build the app once per run, then start it with its
// SMTP sink on free loopback ports and a fresh temporary database. Test files reach it through
// inject('baseUrl') / inject('outboxUrl') / inject('databasePath').
import { spawn, spawnSync, type ChildProcess } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { TestProject } from 'vitest/node'
import { migrateLatest, openDatabase, seedDemoIfEmpty } from '../../db/index'
import { startSmtpSink, type SmtpSink } from '../../scripts/lib/smtp-sink'
import { startStripeFake } from '../../scripts/lib/stripe-fake/index'
import { freePort } from '../../scripts/lib/free-port'

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string
    outboxUrl: string
    databasePath: string
    /** The app server's process id, for tests that read its memory from /proc. */
    serverPid: number
    stripeFakeUrl: string
    stripeWebhookSecret: string
  }
}

async function waitForServer(url: string, child: ChildProcess, timeoutMs = 60_000): Promise<void> {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`The app server exited with code ${child.exitCode}`)
    try {
      const response = await fetch(url)
      if (response.status < 500) return
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250))
  }
  throw new Error(`The app server did not answer at ${url} within ${timeoutMs} ms`)
}

export default async function setup(project: TestProject) {
  if (process.env.KERFBOOK_SKIP_BUILD !== '1') {
    const build = spawnSync('npx', ['nuxt', 'build'], { stdio: 'inherit', env: { ...process.env, NODE_ENV: 'production' } })
    if (build.status !== 0) throw new Error('nuxt build failed')
  }

  const workDir = mkdtempSync(join(tmpdir(), 'kerfbook-test-'))
  const databasePath = join(workDir, 'test.sqlite')
  const db = openDatabase(databasePath)
  await migrateLatest(db)
  await seedDemoIfEmpty(db)
  await db.destroy()

  const sink: SmtpSink = await startSmtpSink()
  const port = await freePort()
  const baseUrl = `http://127.0.0.1:${port}`
  const webhookSecret = `whsec_test_${randomBytes(8).toString('hex')}`
  const stripeFake = await startStripeFake({ webhook: { url: `${baseUrl}/api/webhooks/stripe`, secret: webhookSecret } })
  const server = spawn('node', ['.output/server/index.mjs'], {
    stdio: ['ignore', 'inherit', 'inherit'],
    env: {
      ...process.env,
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      DATABASE_PATH: databasePath,
      SMTP_URL: `smtp://127.0.0.1:${sink.smtpPort}`,
      OUTBOX_URL: `http://127.0.0.1:${sink.httpPort}`,
      APP_URL: baseUrl,
      // Lets each test file act from its own address so the per-IP sign-in limit is testable.
      TRUST_PROXY: '1',
      STRIPE_API_BASE: stripeFake.url,
      STRIPE_SECRET_KEY: 'sk_test_kerfbook_tests',
      STRIPE_WEBHOOK_SECRET: webhookSecret,
      KERFBOOK_REMINDERS: 'off',
      NUXT_SESSION_PASSWORD: randomBytes(32).toString('hex'),
    },
  })
  await waitForServer(`${baseUrl}/api/me`, server)

  project.provide('baseUrl', baseUrl)
  project.provide('outboxUrl', `http://127.0.0.1:${sink.httpPort}`)
  project.provide('databasePath', databasePath)
  project.provide('serverPid', server.pid!)
  project.provide('stripeFakeUrl', stripeFake.url)
  project.provide('stripeWebhookSecret', webhookSecret)

  return async () => {
    server.kill('SIGTERM')
    await sink.close()
    await stripeFake.close()
    rmSync(workDir, { recursive: true, force: true })
  }
}
