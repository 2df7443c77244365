// Vitest global setup for the app project: build the app once per run, then start it (scripts/lib/built-app.ts)
// with its SMTP sink and Stripe fake on free loopback ports and a fresh database. Test files reach it through
// inject('baseUrl'), inject('outboxUrl'), inject('databaseLocation') and the rest below.
// KERFBOOK_TEST_DATABASE=postgres (npm run test:postgres) runs the same tests with the app on PostgreSQL: a throwaway
// server started here (scripts/lib/postgres-server.ts), a new database on it for every app a test starts.
import { spawnSync } from 'node:child_process'
import type { TestProject } from 'vitest/node'
import { describeLocation } from '../../db/knexfile'
import { startBuiltApp } from '../../scripts/lib/built-app'
import { startPostgres, type PostgresServer } from '../../scripts/lib/postgres-server'
import { requireChromium } from './chromium'

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string
    outboxUrl: string
    /** The app's database: a SQLite file or a postgres:// URL (tests/api/helpers.ts `appDb`). */
    databaseLocation: string
    uploadsDir: string
    /** The PostgreSQL server's maintenance URL when the run is on PostgreSQL, for apps a test starts itself. */
    postgresUrl: string | undefined
    /** The app server's process id, for tests that read its memory from /proc. */
    serverPid: number
    stripeFakeUrl: string
    stripeWebhookSecret: string
  }
}

export default async function setup(project: TestProject) {
  // Before the build: a run with browser tests on a machine without Chromium stops here, at once.
  await requireChromium(project)
  let postgres: PostgresServer | undefined
  if (process.env.KERFBOOK_TEST_DATABASE === 'postgres') postgres = await startPostgres('kerfbook-test-pg')
  const start = async () => {
    if (process.env.KERFBOOK_SKIP_BUILD !== '1') {
      const build = spawnSync('npx', ['nuxt', 'build'], { stdio: 'inherit', env: { ...process.env, NODE_ENV: 'production' } })
      if (build.status !== 0) throw new Error('nuxt build failed')
    }
    return startBuiltApp({
      name: 'kerfbook-test',
      showOutput: true,
      // Lets each test file act from its own address so the per-IP sign-in limit is testable.
      env: { TRUST_PROXY: '1' },
      postgresUrl: postgres?.url,
    })
  }
  const app = await start().catch((error) => {
    postgres?.stop()
    throw error
  })
  console.log(`App database: ${describeLocation(app.databaseLocation)}`)
  project.provide('baseUrl', app.baseUrl)
  project.provide('outboxUrl', app.outboxUrl)
  project.provide('databaseLocation', app.databaseLocation)
  project.provide('uploadsDir', app.uploadsDir)
  project.provide('postgresUrl', postgres?.url)
  project.provide('serverPid', app.pid)
  project.provide('stripeFakeUrl', app.stripeFakeUrl)
  project.provide('stripeWebhookSecret', app.stripeWebhookSecret)
  return async () => {
    await app.stop()
    postgres?.stop()
  }
}
