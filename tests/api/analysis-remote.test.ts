// Analyses on a worker machine through the database (ANALYSIS_ROLE, server/utils/analysis-remote.ts): an app server
// with ANALYSIS_ROLE=queue computes nothing itself: its upload waits in `analysis_tasks` until a worker server
// (ANALYSIS_ROLE=worker, same PostgreSQL database) takes it, and then answers what a local analysis answers.
// Runs in `npm run test:postgres` only.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { startBuiltApp, type BuiltApp } from '../../scripts/lib/built-app'
import { SQUARE_100_MM } from '../fixtures/svg'
import { signedIn, sqlRows, svgForm } from './helpers'

const postgresUrl = inject('postgresUrl')

describe.skipIf(!postgresUrl)('analyses on a worker server through the database', () => {
  let front: BuiltApp
  let worker: BuiltApp | undefined

  beforeAll(async () => {
    front = await startBuiltApp({ name: 'kerfbook-queue-front', postgresUrl, env: { TRUST_PROXY: '1', ANALYSIS_ROLE: 'queue' } })
  })

  afterAll(async () => {
    await worker?.stop()
    await front?.stop()
  })

  it('waits in the queue until a worker takes it, then answers as a local analysis does', async () => {
    const member = await signedIn('member@example.test', undefined, front.baseUrl)
    const pending = member.form('/api/analysis', svgForm(SQUARE_100_MM))
    // No worker yet: the task sits in the table and the upload has no answer.
    let queued: { status: string; label: string }[] = []
    for (let i = 0; i < 50 && queued.length === 0; i++) {
      queued = await sqlRows('select status, label from analysis_tasks', [], front.databaseLocation)
      if (queued.length === 0) await new Promise((resolve) => setTimeout(resolve, 100))
    }
    expect(queued).toEqual([{ status: 'queued', label: 'part.svg' }])
    const early = await Promise.race([pending.then(() => 'answered'), new Promise((resolve) => setTimeout(() => resolve('waiting'), 1000))])
    expect(early).toBe('waiting')

    worker = await startBuiltApp({ name: 'kerfbook-queue-worker', sharedDatabase: front.databaseLocation, env: { TRUST_PROXY: '1', ANALYSIS_ROLE: 'worker' } })
    const answer = await pending
    expect(answer.status).toBe(200)
    expect(answer.body.cut.lengthMm).toBeCloseTo(400 + 40 * Math.PI, 3)
    expect(answer.body.cut.pierces).toBe(2)
    // The same file on the tests' own server (a local analysis): the same figures.
    const local = await (await signedIn('member@example.test')).form('/api/analysis', svgForm(SQUARE_100_MM))
    expect(answer.body).toEqual(local.body)
    // The answer taken, the task is gone.
    expect(await sqlRows('select id from analysis_tasks', [], front.databaseLocation)).toEqual([])
  })

  it('gives the engine’s refusal of a bad file through the queue, as a 4xx with its message', async () => {
    const member = await signedIn('member@example.test', undefined, front.baseUrl)
    const broken = '<svg xmlns="http://www.w3.org/2000/svg" width="10mm" height="10mm"><rect x="1" y="1" width="5" height="5" fill="none" stroke="#ff6a00"/>'
    const remote = await member.form('/api/analysis', svgForm(broken, {}, 'broken.svg'))
    const local = await (await signedIn('member@example.test')).form('/api/analysis', svgForm(broken, {}, 'broken.svg'))
    expect(local.status).toBeGreaterThanOrEqual(400)
    expect(local.status).toBeLessThan(500)
    expect(remote.status).toBe(local.status)
    expect(remote.body.message).toBe(local.body.message)
  })
})
