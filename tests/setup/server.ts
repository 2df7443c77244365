// Vitest global setup for the app project: build the app once per run, then start it (scripts/lib/built-app.ts)
// with its SMTP sink and Stripe fake on free loopback ports and a fresh temporary database. Test files reach
// it through inject('baseUrl'), inject('outboxUrl'), inject('databasePath') and the rest below.
import { spawnSync } from 'node:child_process'
import type { TestProject } from 'vitest/node'
import { startBuiltApp } from '../../scripts/lib/built-app'
import { requireChromium } from './chromium'

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

export default async function setup(project: TestProject) {
  // Before the build: a run with browser tests on a machine without Chromium stops here, at once.
  await requireChromium(project)
  if (process.env.KERFBOOK_SKIP_BUILD !== '1') {
    const build = spawnSync('npx', ['nuxt', 'build'], { stdio: 'inherit', env: { ...process.env, NODE_ENV: 'production' } })
    if (build.status !== 0) throw new Error('nuxt build failed')
  }
  const app = await startBuiltApp({
    name: 'kerfbook-test',
    showOutput: true,
    // Lets each test file act from its own address so the per-IP sign-in limit is testable.
    env: { TRUST_PROXY: '1' },
  })
  project.provide('baseUrl', app.baseUrl)
  project.provide('outboxUrl', app.outboxUrl)
  project.provide('databasePath', app.databasePath)
  project.provide('serverPid', app.pid)
  project.provide('stripeFakeUrl', app.stripeFakeUrl)
  project.provide('stripeWebhookSecret', app.stripeWebhookSecret)
  return () => app.stop()
}
