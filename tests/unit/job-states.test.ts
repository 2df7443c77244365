import type { Knex } from 'knex'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { migrateLatest, openDatabase } from '../../db/index'
import { availableActions, JOB_TRANSITIONS, transitionJob, type JobAction } from '../../server/services/job-states'
import type { SessionUser } from '../../shared/roles'

let db: Knex
const member: SessionUser = { id: 1, email: 'm@example.test', name: 'M', role: 'member' }
const stranger: SessionUser = { id: 2, email: 's@example.test', name: 'S', role: 'member' }
const staff: SessionUser = { id: 3, email: 't@example.test', name: 'T', role: 'staff' }

async function jobIn(state: string): Promise<number> {
  const [id] = await db('jobs').insert({ member_id: 1, title: 't', cutter_id: 1, material_id: 1, sheet_id: 1, state })
  return id!
}

function move(jobId: number, action: JobAction, actor: SessionUser | 'system', comment = 'because') {
  return db.transaction((trx) => transitionJob(trx, jobId, action, actor, { comment }))
}

beforeAll(async () => {
  db = openDatabase(':memory:')
  await migrateLatest(db)
  await db('users').insert([1, 2, 3].map((id) => ({ id, email: `${id}@example.test`, name: String(id), password_hash: 'x', role: id === 3 ? 'staff' : 'member' })))
  await db('cutters').insert({ id: 1, name: 'c', kind: 'plasma', bed_width_mm: 1, bed_height_mm: 1, max_thickness_mm: 1, price_per_minute_minor: 1, currency: 'EUR', setup_minutes: 0, billing_increment_minutes: 1, booking_granularity_minutes: 15, max_speed_mm_per_min: 1, accel_mm_per_s2: 0, rapid_mm_per_min: 1, junction_deviation_mm: 0, pierce_overhead_s: 0 })
  await db('materials').insert({ id: 1, name: 'm', family: 'other', thickness_mm: 1 })
  await db('material_sheets').insert({ id: 1, material_id: 1, width_mm: 1, height_mm: 1, price_minor: 0, currency: 'EUR' })
})
afterAll(() => db.destroy())

describe('job transitions', () => {
  it('follows the happy path with one audit row per move', async () => {
    const id = await jobIn('draft')
    const path: [JobAction, SessionUser | 'system'][] = [
      ['submit', member], ['approve', staff], ['book', 'system'], ['startCutting', staff], ['finishCutting', staff], ['markReady', staff], ['markCollected', staff],
    ]
    for (const [action, actor] of path) await move(id, action, actor)
    expect((await db('jobs').where({ id }).first()).state).toBe('collected')
    const events = await db('job_events').where({ job_id: id }).orderBy('id')
    expect(events.map((e) => `${e.from_state}>${e.to_state}`)).toEqual([
      'draft>submitted', 'submitted>approved', 'approved>booked', 'booked>cutting', 'cutting>cut', 'cut>ready', 'ready>collected',
    ])
  })

  it('never lets a job skip a step, and a refused move writes nothing', async () => {
    const id = await jobIn('draft')
    for (const action of ['book', 'approve', 'startCutting', 'markReady', 'markCollected', 'cancel'] as JobAction[]) {
      await expect(move(id, action, action === 'book' ? 'system' : staff)).rejects.toThrow(/can't be/)
    }
    expect((await db('jobs').where({ id }).first()).state).toBe('draft')
    expect(await db('job_events').where({ job_id: id })).toHaveLength(0)
  })

  it('lets only the right people move', async () => {
    const id = await jobIn('submitted')
    await expect(move(id, 'approve', member)).rejects.toThrow(/can't approve/)
    await expect(move(id, 'withdraw', stranger)).rejects.toThrow(/can't withdraw/)
    await expect(move(id, 'withdraw', staff)).rejects.toThrow(/can't withdraw/)
    // Booking happens only through the booking service, never by a person directly.
    const approved = await jobIn('approved')
    await expect(move(approved, 'book', staff)).rejects.toThrow(/can't book/)
  })

  it('needs a comment to ask for changes or turn a job down', async () => {
    const id = await jobIn('submitted')
    await expect(move(id, 'requestChanges', staff, '  ')).rejects.toThrow(/say why/)
    await expect(move(id, 'reject', staff, '')).rejects.toThrow(/say why/)
  })

  it('offers each viewer exactly the moves the table allows', async () => {
    expect(availableActions('draft', member, 1).sort()).toEqual(['submit', 'withdraw'])
    expect(availableActions('submitted', staff, 1).sort()).toEqual(['approve', 'reject', 'requestChanges'])
    expect(availableActions('submitted', stranger, 1)).toEqual([])
    // Every target state is reachable from draft.
    const reachable = new Set(['draft'])
    let grew = true
    while (grew) {
      grew = false
      for (const t of Object.values(JOB_TRANSITIONS)) {
        if (t.from.some((f) => reachable.has(f)) && !reachable.has(t.to)) {
          reachable.add(t.to)
          grew = true
        }
      }
    }
    expect([...reachable].sort()).toEqual(['approved', 'booked', 'cancelled', 'changes_requested', 'collected', 'cut', 'cutting', 'draft', 'ready', 'rejected', 'submitted', 'withdrawn'])
  })
})
