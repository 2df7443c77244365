// Paged lists over a generated history, read page by page while new rows arrive between the reads: every row
// that was there at the start is read exactly once, and no row is read twice.
import type { Knex } from 'knex'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from '#shared/schemas/paging'
import { seedHistory } from '../../../db/seeds/history'
import { jobEventsPage } from '../../../server/services/job-events'
import { listJobs, listJobsPage } from '../../../server/services/jobs'
import { undeliveredMail, undeliveredMailPage } from '../../../server/services/mail-outbox'
import { listUsersPage } from '../../../server/services/member-list'
import { listUsers } from '../../../server/services/accounts'
import { listPayments, listPaymentsPage } from '../../../server/services/payment-list'
import { demoDatabase } from './database'

let db: Knex
let close: () => Promise<void>
const staff = { id: 2, email: 'staff@example.test', name: 'Staff', role: 'staff' as const }
let added = 0

beforeAll(async () => {
  ;({ db, close } = await demoDatabase())
  staff.id = (await db('users').where({ email: 'staff@example.test' }).first('id')).id
  await seedHistory(db, { jobs: 300, days: 120, seed: 11, bookings: 700, now: new Date('2026-11-20T12:00:00Z') })
}, 120_000)

afterAll(() => close())

/** Rows of every kind the lists show, written "now" (between two page reads). */
async function addRows(jobId: number) {
  added++
  const member = (await db('users').where({ role: 'member' }).orderBy('id').first('id')).id
  const sheet = await db('material_sheets').first('id', 'material_id')
  const cutter = (await db('cutters').first('id')).id
  const [newJob] = await db('jobs').insert({ member_id: member, title: `Arrived meanwhile ${added}`, cutter_id: cutter, material_id: sheet.material_id, sheet_id: sheet.id, state: 'submitted', submitted_at: new Date().toISOString() })
  const at = new Date(Date.UTC(2026, 10, 1 + added, 9)).toISOString()
  const [booking] = await db('bookings').insert({ cutter_id: cutter, job_id: newJob, member_id: member, kind: 'job', starts_at: at, ends_at: at.replace('T09', 'T10'), status: 'cancelled', ical_uid: `meanwhile-${added}`, checkout_session_id: `cs_meanwhile_${added}`, currency: 'EUR' })
  await db('payment_ledger').insert({ booking_id: booking, job_id: newJob, member_id: member, kind: 'authorised', amount_minor: 100, currency: 'EUR', stripe_object_id: 'pi', ledger_key: `meanwhile:${added}` })
  await db('users').insert([{ email: `aaron-${added}@example.test`, name: `Aaron Meanwhile ${added}`, password_hash: 'x', role: 'member' }, { email: `zed-${added}@example.test`, name: `Zed Meanwhile ${added}`, password_hash: 'x', role: 'member' }])
  await db('mail_outbox').insert({ recipient: 'x@example.test', subject: 'meanwhile', message_json: '{}', status: 'dead', attempts: 10, next_attempt_at: at })
  await db('job_events').insert({ job_id: jobId, from_state: 'collected', to_state: 'collected', comment: `note ${added}` })
}

async function readAll<Item>(
  readPage: (cursor?: string) => Promise<Page<Item>>,
  idOf: (item: Item) => number | string,
  jobId: number,
): Promise<(number | string)[]> {
  const seen: (number | string)[] = []
  let cursor: string | undefined
  for (let pages = 0; pages < 1000; pages++) {
    const page = await readPage(cursor)
    seen.push(...page.items.map(idOf))
    if (!page.nextCursor) return seen
    cursor = page.nextCursor
    await addRows(jobId)
  }
  throw new Error('no last page')
}

function expectOnceEach(seen: (number | string)[], before: (number | string)[]) {
  expect(new Set(seen).size, 'a row read twice').toBe(seen.length)
  const read = new Set(seen)
  expect(before.filter((id) => !read.has(id)), 'rows lost').toEqual([])
}

describe('paged lists while rows are added', () => {
  let jobId: number
  beforeAll(async () => {
    jobId = (await db('job_events').groupBy('job_id').orderByRaw('count(*) desc').first('job_id')).job_id
  })

  it('every job (staff), oldest waiting first and newest first', { timeout: 120_000 }, async () => {
    const before = (await listJobs(db, staff, { scope: 'all' })).map((j) => j.id)
    expect(before.length).toBeGreaterThanOrEqual(300)
    expectOnceEach(await readAll((cursor) => listJobsPage(db, staff, { scope: 'all' }, { limit: 37, cursor }), (j) => j.id, jobId), before)
    const now = (await listJobs(db, staff, { scope: 'all' })).map((j) => j.id)
    expectOnceEach(await readAll((cursor) => listJobsPage(db, staff, { scope: 'all', order: 'newest' }, { limit: 41, cursor }), (j) => j.id, jobId), now)
  })

  it('the review queue', { timeout: 120_000 }, async () => {
    const before = (await listJobs(db, staff, { scope: 'all', state: 'submitted' })).map((j) => j.id)
    expect(before.length).toBeGreaterThan(3)
    expectOnceEach(await readAll((cursor) => listJobsPage(db, staff, { scope: 'all', state: 'submitted' }, { limit: 2, cursor }), (j) => j.id, jobId), before)
  })

  it('payments, every one and one state', { timeout: 120_000 }, async () => {
    const before = (await listPayments(db, {})).map((p) => p.bookingId)
    expect(before.length).toBeGreaterThan(500)
    expectOnceEach(await readAll((cursor) => listPaymentsPage(db, {}, { limit: 50, cursor }), (p) => p.bookingId, jobId), before)
    const captured = (await listPayments(db, { state: 'captured' })).map((p) => p.bookingId)
    expect(captured.length).toBeGreaterThan(20)
    expectOnceEach(await readAll((cursor) => listPaymentsPage(db, { state: 'captured' }, { limit: 9, cursor }), (p) => p.bookingId, jobId), captured)
  })

  it('a member’s own payments', { timeout: 120_000 }, async () => {
    const memberId = (await db('bookings').whereNotNull('checkout_session_id').groupBy('member_id').orderByRaw('count(*) desc').first('member_id')).member_id
    const before = (await listPayments(db, { memberId })).map((p) => p.bookingId)
    expectOnceEach(await readAll((cursor) => listPaymentsPage(db, { memberId }, { limit: 4, cursor }), (p) => p.bookingId, jobId), before)
  })

  it('members by name', { timeout: 120_000 }, async () => {
    const before = (await listUsers(db, { role: 'member' })).map((u) => u.id)
    expectOnceEach(await readAll((cursor) => listUsersPage(db, { role: 'member' }, { limit: 3, cursor }), (u) => u.id, jobId), before)
  })

  it('undelivered mail, newest first', { timeout: 120_000 }, async () => {
    const before = (await undeliveredMail(db)).map((m) => m.id)
    expect(before.length).toBeGreaterThan(2)
    expectOnceEach(await readAll((cursor) => undeliveredMailPage(db, { limit: 2, cursor }), (m) => m.id, jobId), before)
  })

  it('a job’s history', { timeout: 120_000 }, async () => {
    const before = (await db('job_events').where({ job_id: jobId }).pluck('id')) as number[]
    expectOnceEach(await readAll((cursor) => jobEventsPage(db, staff, jobId, { limit: 2, cursor }), (e) => e.id, jobId), before)
  })

  it('refuses a damaged cursor with a sentence, not a server error', { timeout: 120_000 }, async () => {
    await expect(listJobsPage(db, staff, { scope: 'all' }, { limit: 5, cursor: 'bm90LWpzb24' })).rejects.toThrow('This page link is damaged')
  })
})
