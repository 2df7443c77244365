// The same seeded history in a SQLite file and in a PostgreSQL database must give the same figures: every report of
// the registry (over two years, a quarter, single weeks round the clock changes, and a span running into the bookings
// ahead; for each cutter and for all), its CSV, the admin's payments list with its totals, and the staff's list of every
// job walked page by page. Both databases are written by the same seeds from one fixed instant and one seed, so their
// rows, ids included, are identical; any difference in an answer is the database's doing. PostgreSQL is asked twice:
// in a database with byte-wise text order, as the README has it created (and as SQLite compares text), and in one whose
// text sorts by a language's rules (ICU en-US), as a database created with a server's usual defaults would: these
// answers must not depend on that step being followed. Runs in `npm run test:postgres` only: it needs a PostgreSQL server.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Knex } from 'knex'
import { DateTime } from 'luxon'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import type { SessionUser } from '#shared/roles'
import type { ReportName } from '#shared/schemas/reports'
import { migrateLatest, openDatabase } from '../../db/index'
import { createPostgresDatabase } from '../../scripts/lib/postgres-server'
import { hashPasswordOffline } from '../../db/password-hash'
import { demoSettings, seedDemo } from '../../db/seeds/demo'
import { seedHistory, type HistoryCounts } from '../../db/seeds/history'
import { listJobsPage, type JobListFilter } from '../../server/services/jobs'
import { listPayments, listPaymentsPage, paymentTotals, type PaymentFilter } from '../../server/services/payment-list'
import { REPORTS, reportCsv, resolveRange } from '../../server/services/reports/index'

const postgresUrl = inject('postgresUrl')

// One instant for both seeds: three days after the end of summer time in the workshop's zone (Europe/Dublin,
// 25 October 2026), so the history's last weeks straddle a clock change and its bookings run two weeks on.
const NOW = new Date('2026-10-28T14:30:00.000Z')
const HISTORY = { jobs: 1500, days: 731, seed: 4_242, now: NOW }
const PAGE_SIZE = 97

const today = DateTime.fromJSDate(NOW, { zone: demoSettings.timeZone }).startOf('day')
const RANGES: Record<string, { from: string; to: string }> = {
  '731 days': { from: today.minus({ days: 731 }).toISODate()!, to: today.toISODate()! },
  '90 days': { from: today.minus({ days: 90 }).toISODate()!, to: today.toISODate()! },
  // Monday to Monday, summer time ending on its Sunday.
  'the week summer time ended': { from: '2026-10-19', to: '2026-10-26' },
  // Wednesday to Thursday: clipped weeks at both ends, summer time starting on 29 March.
  'eight days round the start of summer time': { from: '2026-03-25', to: '2026-04-02' },
  // A week back and three ahead: held and confirmed bookings to come, and the demo's closures.
  'four weeks round now': { from: today.minus({ weeks: 1 }).toISODate()!, to: today.plus({ weeks: 3 }).toISODate()! },
}

/** What a database answered, by a key that says what was asked. */
type Answers = Map<string, unknown>

/** The PostgreSQL databases compared with SQLite: how each is created after CREATE DATABASE and its name. */
const POSTGRES_DATABASES: Record<string, string> = {
  PostgreSQL: '',
  'PostgreSQL, ICU en-US collation': `TEMPLATE template0 LOCALE_PROVIDER icu ICU_LOCALE 'en-US' LOCALE 'C.UTF-8'`,
}

/**
 * The demo workshop (as seedDemoIfEmpty writes it into an empty database, but at NOW) and the history. Then what the
 * history leaves out, the same way in both: every 20th cut finished before its finish time and sheets were recorded
 * (the reports fall back to the job's move to `cut`, and count its sheets as unknown).
 */
async function seeded(location: string): Promise<{ db: Knex; counts: HistoryCounts }> {
  const db = openDatabase(location)
  await migrateLatest(db)
  await seedDemo(db, hashPasswordOffline, { now: NOW })
  const counts = await seedHistory(db, HISTORY)
  const older = (await db('jobs').whereNotNull('cut_finished_at').orderBy('id').pluck('id')).filter((_: number, i: number) => i % 20 === 0)
  await db('jobs').whereIn('id', older).update({ cut_finished_at: null, sheets_used: null })
  return { db, counts }
}

/** Every report over every range, for all cutters and each one: the JSON answer and the CSV, by a readable key. */
async function everyReport(db: Knex, cutterIds: number[]): Promise<Answers> {
  const answers: Answers = new Map()
  for (const [rangeName, range] of Object.entries(RANGES)) {
    for (const cutter of [undefined, ...cutterIds]) {
      const resolved = await resolveRange(db, { ...range, cutter })
      for (const name of Object.keys(REPORTS) as ReportName[]) {
        const report = await REPORTS[name].build(db, resolved)
        answers.set(`${name}, ${rangeName}, cutter ${cutter ?? 'all'}`, { report, csv: reportCsv(name, report) })
      }
    }
  }
  return answers
}

/** Every page of a keyset-paged list, in order, with the cursors that led from one to the next. */
async function allPages<Item>(read: (cursor?: string) => Promise<{ items: Item[]; nextCursor: string | null }>): Promise<{ items: Item[]; cursors: string[] }> {
  const items: Item[] = []
  const cursors: string[] = []
  let cursor: string | undefined
  do {
    const page = await read(cursor)
    items.push(...page.items)
    cursor = page.nextCursor ?? undefined
    if (cursor) cursors.push(cursor)
  } while (cursor)
  return { items, cursors }
}

const PAYMENT_FILTERS: Record<string, PaymentFilter> = {
  all: {},
  captured: { state: 'captured' },
  'partly refunded': { state: 'partly-refunded' },
  released: { state: 'released' },
  'starting in the last 90 days': { from: RANGES['90 days']!.from, to: RANGES['90 days']!.to },
}

async function paymentAnswers(db: Knex): Promise<Answers> {
  const answers: Answers = new Map()
  for (const [name, filter] of Object.entries(PAYMENT_FILTERS)) {
    answers.set(`payments ${name}: whole list`, await listPayments(db, filter))
    answers.set(`payments ${name}: pages`, await allPages((cursor) => listPaymentsPage(db, filter, { limit: PAGE_SIZE, cursor })))
    answers.set(`payments ${name}: totals`, await paymentTotals(db, filter))
  }
  return answers
}

const JOB_FILTERS: Record<string, JobListFilter> = {
  'every job, oldest waiting first': { scope: 'all' },
  'every job, newest first': { scope: 'all', order: 'newest' },
  'review queue': { scope: 'all', state: 'submitted' },
  'waiting for pickup or collected': { scope: 'all', state: 'ready,collected' },
}

async function jobAnswers(db: Knex, staff: SessionUser): Promise<Answers> {
  const answers: Answers = new Map()
  for (const [name, filter] of Object.entries(JOB_FILTERS)) answers.set(`jobs ${name}`, await allPages((cursor) => listJobsPage(db, staff, filter, { limit: PAGE_SIZE, cursor })))
  return answers
}

/**
 * Each answer of every PostgreSQL database against the same answer on SQLite, so a failure names the one that differs.
 * Compared in the order the services give, not a canonical one: every report and list sorts on keys that end unique
 * (an id, a week with a cutter and currency, a name), so two databases holding the same rows must agree on the order too.
 */
async function expectSameAnswers(answersOf: (db: Knex) => Promise<Answers>, sqlite: Knex, postgres: Map<string, Knex>): Promise<Answers> {
  const onSqlite = await answersOf(sqlite)
  for (const [database, db] of postgres) {
    const onPostgres = await answersOf(db)
    expect([...onPostgres.keys()], database).toEqual([...onSqlite.keys()])
    for (const [key, answer] of onSqlite) expect(onPostgres.get(key), `${database}: ${key}`).toStrictEqual(answer)
  }
  return onSqlite
}

describe.skipIf(!postgresUrl)('reports and lists on SQLite and PostgreSQL over the same history', () => {
  let sqliteDir: string
  let sqlite: Knex
  const postgres = new Map<string, Knex>()
  let cutterIds: number[]
  let staff: SessionUser

  beforeAll(async () => {
    sqliteDir = mkdtempSync(join(tmpdir(), 'kerfbook-reports-both-'))
    // One after the other: the machine's two CPUs are shared with the app server under test.
    const onSqlite = await seeded(join(sqliteDir, 'history.sqlite'))
    sqlite = onSqlite.db
    for (const [database, options] of Object.entries(POSTGRES_DATABASES)) {
      const onPostgres = await seeded(await createPostgresDatabase(postgresUrl!, 'kerfbook_reports', options))
      postgres.set(database, onPostgres.db)
      expect(onPostgres.counts, database).toEqual(onSqlite.counts)
    }
    cutterIds = await sqlite('cutters').orderBy('id').pluck('id')
    staff = await sqlite('users').where({ email: 'staff@example.test' }).first('id', 'email', 'name', 'role')
  })

  afterAll(async () => {
    await sqlite?.destroy()
    for (const db of postgres.values()) await db.destroy()
    if (sqliteDir) rmSync(sqliteDir, { recursive: true, force: true })
  })

  it('gives every report the same rows, summary and CSV', async () => {
    const onSqlite = await expectSameAnswers((db) => everyReport(db, cutterIds), sqlite, postgres)
    // Not two empty answers agreeing: the history fills the two years' reports.
    for (const name of Object.keys(REPORTS)) expect((onSqlite.get(`${name}, 731 days, cutter all`) as { report: { rows: unknown[] } }).report.rows.length, name).toBeGreaterThan(0)
    // The cuts without a recorded finish time were found through their events.
    const materials = onSqlite.get('materials, 731 days, cutter all') as { report: { rows: { jobsWithoutSheetCount: number }[] } }
    expect(materials.report.rows.some((row) => row.jobsWithoutSheetCount > 0)).toBe(true)
  })

  it('lists the same payments, page by page and whole, with the same totals', async () => {
    const onSqlite = await expectSameAnswers(paymentAnswers, sqlite, postgres)
    const all = onSqlite.get('payments all: pages') as { items: unknown[]; cursors: string[] }
    expect(all.items.length).toBeGreaterThan(5 * PAGE_SIZE)
    expect(all.items).toEqual(onSqlite.get('payments all: whole list'))
  })

  it('lists the same jobs for staff, page by page', async () => {
    const onSqlite = await expectSameAnswers((db) => jobAnswers(db, staff), sqlite, postgres)
    expect((onSqlite.get('jobs every job, oldest waiting first') as { items: unknown[] }).items).toHaveLength(HISTORY.jobs)
  })
})
