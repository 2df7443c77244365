// The sweep of analysis tasks nobody waits for any more (server/utils/analysis-remote.ts): an app server that stopped
// while its upload waited leaves its task behind; after the longest an analysis may take, the background duty
// deletes it, and leaves every younger task alone.
import knex, { type Knex } from 'knex'
import { afterEach, describe, expect, it } from 'vitest'
import { migrationSource } from '../../db/migrations/index'
import { ABANDONED_TASK_MS, sweepAbandonedTasks } from '../../server/utils/analysis-remote'

let db: Knex | undefined

afterEach(async () => {
  await db?.destroy()
  db = undefined
})

describe('sweepAbandonedTasks', () => {
  it('deletes the tasks older than the abandonment age and keeps the rest', async () => {
    db = knex({ client: 'better-sqlite3', connection: { filename: ':memory:' }, useNullAsDefault: true, pool: { min: 1, max: 1 }, migrations: { migrationSource } })
    await db.migrate.latest()
    const now = Date.parse('2026-12-04T12:00:00.000Z')
    const task = (label: string, ageMs: number, status: string) => ({
      label, status, input_text: '<svg/>', params_json: '{}', created_at: new Date(now - ageMs).toISOString(),
    })
    await db('analysis_tasks').insert([
      task('left queued', ABANDONED_TASK_MS + 1000, 'queued'),
      task('left done', ABANDONED_TASK_MS + 60_000, 'done'),
      task('just under the age', ABANDONED_TASK_MS - 1000, 'running'),
      task('new', 0, 'queued'),
    ])
    expect(await sweepAbandonedTasks(db, now)).toBe(2)
    expect((await db('analysis_tasks').orderBy('id').select('label')).map((t) => t.label)).toEqual(['just under the age', 'new'])
  })
})
