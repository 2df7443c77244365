// Starts the built server (.output) on loopback with everything it talks to: a fresh seeded database (a SQLite
// file in a temporary folder, or a new database on a PostgreSQL server), the SMTP sink and the Stripe fake with its
// webhooks pointed at the app. The tests' global setup and the load benchmarks run the app this way.
import { spawn, type ChildProcess } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Knex } from 'knex'
import { migrateLatest, openDatabase, seedDemoIfEmpty } from '../../db/index'
import { isPostgresUrl } from '../../db/knexfile'
import { freePort } from './free-port'
import { createPostgresDatabase } from './postgres-server'
import { startSmtpSink } from './smtp-sink'
import { startStripeFake } from './stripe-fake/index'

/**
 * glibc keeps the memory of a large analysis's short-lived buffers in its arenas long after they are freed;
 * two arenas, mmap for blocks over 128 KiB and trimming on every free hand it back to the system (measured
 * with four 6.7 MB uploads at once: RSS 30 s later 763 → 169 MB). `npm start` sets the same.
 */
export const SERVER_MALLOC_ENV = { MALLOC_ARENA_MAX: '2', MALLOC_MMAP_THRESHOLD_: '131072', MALLOC_TRIM_THRESHOLD_: '0' }

export interface BuiltApp {
  baseUrl: string
  outboxUrl: string
  /** The SQLite file, or the postgres:// URL of the app's own database (openDatabase takes either). */
  databaseLocation: string
  /** Where the app stores uploaded originals. */
  uploadsDir: string
  workDir: string
  stripeFakeUrl: string
  stripeWebhookSecret: string
  pid: number
  sessionPassword: string
  stop(): Promise<void>
  /** Kills the server at once (SIGKILL, as a crash would) and starts it again on the same database, mail sink and Stripe fake. */
  restartAfterCrash(): Promise<void>
}

export interface BuiltAppOptions {
  /** Folder holding the build (`server/index.mjs`); `.output` by default. */
  outputDir?: string
  /** Prefix of the temporary folder. */
  name: string
  /** More environment for the server, e.g. relaxed limits for a load test. */
  env?: Record<string, string>
  /** Show the server's stdout (its stderr always shows). */
  showOutput?: boolean
  /** Writes more into the seeded database before the server starts (e.g. years of history). */
  prepare?: (db: Knex) => Promise<void>
  /** A PostgreSQL server's maintenance URL (postgres://…/postgres): the app gets a new database there instead of a SQLite file. */
  postgresUrl?: string
  /** A database already migrated and seeded (its location): a second app server on the same data. */
  sharedDatabase?: string
  /** The key sealing session cookies; app servers behind one address share it. A new random one by default. */
  sessionPassword?: string
}

async function waitForServer(url: string, child: ChildProcess, timeoutMs = 60_000): Promise<void> {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`The app server exited with code ${child.exitCode}`)
    const response = await fetch(url).catch(() => undefined)
    if (response && response.status < 500) return
    await new Promise((r) => setTimeout(r, 250))
  }
  throw new Error(`The app server did not answer at ${url} within ${timeoutMs} ms`)
}

export async function startBuiltApp(options: BuiltAppOptions): Promise<BuiltApp> {
  const workDir = mkdtempSync(join(tmpdir(), `${options.name}-`))
  const uploadsDir = join(workDir, 'uploads')
  const newLocation = async () => (options.postgresUrl ? createPostgresDatabase(options.postgresUrl, options.name) : join(workDir, 'app.sqlite'))
  const databaseLocation = options.sharedDatabase ?? (await newLocation())
  if (!options.sharedDatabase) {
    const db = openDatabase(databaseLocation)
    await migrateLatest(db)
    await seedDemoIfEmpty(db)
    await options.prepare?.(db)
    await db.destroy()
  }

  const sink = await startSmtpSink()
  const port = await freePort()
  const baseUrl = `http://127.0.0.1:${port}`
  const stripeWebhookSecret = `whsec_${options.name}_${randomBytes(8).toString('hex')}`
  const stripeFake = await startStripeFake({ webhook: { url: `${baseUrl}/api/webhooks/stripe`, secret: stripeWebhookSecret } })
  const outboxUrl = `http://127.0.0.1:${sink.httpPort}`
  const sessionPassword = options.sessionPassword ?? randomBytes(32).toString('hex')
  const spawnServer = () => spawn('node', [join(options.outputDir ?? '.output', 'server/index.mjs')], {
    stdio: ['ignore', options.showOutput ? 'inherit' : 'ignore', 'inherit'],
    env: {
      ...process.env,
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      ...(isPostgresUrl(databaseLocation) ? { DATABASE_URL: databaseLocation } : { DATABASE_PATH: databaseLocation }),
      UPLOADS_PATH: uploadsDir,
      SMTP_URL: `smtp://127.0.0.1:${sink.smtpPort}`,
      OUTBOX_URL: outboxUrl,
      APP_URL: baseUrl,
      STRIPE_API_BASE: stripeFake.url,
      STRIPE_SECRET_KEY: 'sk_test_kerfbook_local_run',
      STRIPE_WEBHOOK_SECRET: stripeWebhookSecret,
      KERFBOOK_REMINDERS: 'off',
      ...SERVER_MALLOC_ENV,
      NUXT_SESSION_PASSWORD: sessionPassword,
      ...options.env,
    },
  })
  let server = spawnServer()
  const stop = async () => {
    // A graceful stop first; a server still running after ten seconds is killed, so no test run leaves one behind.
    const exited = server.exitCode !== null || server.signalCode !== null ? Promise.resolve() : new Promise((resolve) => server.once('exit', resolve))
    server.kill('SIGTERM')
    const killer = setTimeout(() => server.kill('SIGKILL'), 10_000)
    await exited
    clearTimeout(killer)
    await sink.close()
    await stripeFake.close()
    rmSync(workDir, { recursive: true, force: true })
  }
  try {
    await waitForServer(`${baseUrl}/api/me`, server)
  } catch (error) {
    await stop()
    throw error
  }
  const restartAfterCrash = async () => {
    const exited = new Promise((resolve) => server.once('exit', resolve))
    server.kill('SIGKILL')
    await exited
    server = spawnServer()
    await waitForServer(`${baseUrl}/api/me`, server)
  }
  return {
    baseUrl,
    outboxUrl,
    databaseLocation,
    uploadsDir,
    workDir,
    stripeFakeUrl: stripeFake.url,
    stripeWebhookSecret,
    pid: server.pid!,
    sessionPassword,
    stop,
    restartAfterCrash,
  }
}
