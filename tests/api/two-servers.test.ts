// Two app servers on one PostgreSQL database, as the README's deployment runs them: the background duties (hold
// release, day-before and pickup reminders) run on both, every 200 ms, and still act on each row once; a session
// signed in on one server is good on the other; a booking race spread over both gives one booking. Runs in
// `npm run test:postgres` only (SQLite has one app server per database file).
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { startBuiltApp, type BuiltApp } from '../../scripts/lib/built-app'
import { client, signedIn, sqlRow, sqlRows } from './helpers'
import { bookingBench } from './workshop-setup'

const postgresUrl = inject('postgresUrl')
const ROWS_PER_DUTY = 12

describe.skipIf(!postgresUrl)('two app servers on one PostgreSQL database', () => {
  let first: BuiltApp
  let second: BuiltApp

  beforeAll(async () => {
    const env = { TRUST_PROXY: '1', KERFBOOK_REMINDERS: 'on', KERFBOOK_DUTY_EVERY_MS: '200' }
    first = await startBuiltApp({ name: 'kerfbook-two-a', postgresUrl, env })
    second = await startBuiltApp({ name: 'kerfbook-two-b', sharedDatabase: first.databaseLocation, sessionPassword: first.sessionPassword, env })
  })

  afterAll(async () => {
    await second?.stop()
    await first?.stop()
  })

  it('runs each background duty once per row while both servers run it', async () => {
    const location = first.databaseLocation
    const [member] = await sqlRows<{ id: number }>("select id from users where email = 'member@example.test'", [], location)
    const [sheet] = await sqlRows<{ cutter_id: number; material_id: number; sheet_id: number }>(
      'select p.cutter_id, p.material_id, s.id as sheet_id from process_settings p join material_sheets s on s.material_id = p.material_id order by p.id limit 1',
      [],
      location,
    )
    const day = 86_400_000
    const iso = (ms: number) => new Date(ms).toISOString()
    const tomorrowNoon = Date.parse(new Date(Date.now() + day).toISOString().slice(0, 10) + 'T12:00:00.000Z')
    const jobIds: Record<'held' | 'reminder' | 'pickup', number[]> = { held: [], reminder: [], pickup: [] }
    // Written straight into the database while both servers' duties already run: held bookings whose time to pay
    // ran out, confirmed bookings tomorrow not yet reminded, parts waiting on the shelf for weeks.
    await Promise.all(
      (['held', 'reminder', 'pickup'] as const).flatMap((kind) =>
        Array.from({ length: ROWS_PER_DUTY }, async (_, i) => {
          const state = kind === 'held' ? 'booked' : kind === 'reminder' ? 'booked' : 'ready'
          const [job] = await sqlRows<{ id: number }>(
            'insert into jobs (member_id, title, cutter_id, material_id, sheet_id, state, ready_at, pickup_location, pickup_code) values (?, ?, ?, ?, ?, ?, ?, ?, ?) returning id',
            [member!.id, `Two servers ${kind} ${i}`, sheet!.cutter_id, sheet!.material_id, sheet!.sheet_id, state, ...(kind === 'pickup' ? [iso(Date.now() - 30 * day), 'Shelf 2', `TWO${i}`] : [null, null, null])],
            location,
          )
          jobIds[kind].push(job!.id)
          if (kind === 'pickup') return
          // Each booking its own quarter hour, so none overlaps another.
          const start = kind === 'held' ? Date.now() + 3 * day + i * 900_000 : tomorrowNoon - 6 * 3600_000 + i * 900_000
          await sqlRows(
            'insert into bookings (cutter_id, job_id, member_id, kind, starts_at, ends_at, status, hold_expires_at, ical_uid) values (?, ?, ?, ?, ?, ?, ?, ?, ?)',
            [sheet!.cutter_id, job!.id, member!.id, 'job', iso(start), iso(start + 600_000), kind === 'held' ? 'held' : 'confirmed', kind === 'held' ? iso(Date.now() + 400) : null, `two-${kind}-${i}-${job!.id}@kerfbook`],
            location,
          )
        }),
      ),
    )

    const done = async () => {
      const released = await sqlRow<{ n: number }>(`select count(*) as n from bookings where status = 'cancelled' and job_id in (${jobIds.held.join(',')})`, [], location)
      const reminded = await sqlRow<{ n: number }>(`select count(*) as n from bookings where reminder_sent_at is not null and job_id in (${jobIds.reminder.join(',')})`, [], location)
      const shelved = await sqlRow<{ n: number }>(`select count(*) as n from jobs where pickup_reminded_at is not null and id in (${jobIds.pickup.join(',')})`, [], location)
      return released!.n === ROWS_PER_DUTY && reminded!.n === ROWS_PER_DUTY && shelved!.n === ROWS_PER_DUTY
    }
    const deadline = Date.now() + 30_000
    while (!(await done())) {
      if (Date.now() > deadline) throw new Error('The duties did not act on every row within 30 s')
      await new Promise((resolve) => setTimeout(resolve, 200))
    }
    // A few more rounds on both servers: nothing may be acted on twice afterwards either.
    await new Promise((resolve) => setTimeout(resolve, 1500))

    const unbooked = await sqlRows<{ job_id: number; n: number }>(
      `select job_id, count(*) as n from job_events where from_state = 'booked' and to_state = 'approved' and job_id in (${jobIds.held.join(',')}) group by job_id`,
      [],
      location,
    )
    expect(unbooked.map((r) => r.n)).toEqual(Array(ROWS_PER_DUTY).fill(1))
    const reminders = await sqlRow<{ n: number }>("select count(*) as n from mail_outbox where subject = 'Reminder: your cutter time is tomorrow' and created_at > ?", [iso(Date.now() - 120_000)], location)
    expect(reminders!.n).toBe(ROWS_PER_DUTY)
    const titles = jobIds.pickup.map((id) => `Your parts are still waiting: Two servers pickup ${jobIds.pickup.indexOf(id)}`)
    const pickups = await sqlRows<{ subject: string }>(`select subject from mail_outbox where subject like 'Your parts are still waiting: Two servers pickup %'`, [], location)
    expect(pickups.map((r) => r.subject).sort()).toEqual(titles.sort())
  })

  it('keeps a session signed in on one server good on the other', async () => {
    const member = await signedIn('member@example.test', undefined, first.baseUrl)
    const cookie = member.cookie()
    const other = client(undefined, second.baseUrl)
    other.useCookie(cookie)
    const me = await other.get('/api/me')
    expect(me.status).toBe(200)
    expect(me.body.email).toBe('member@example.test')
  })

  it('gives exactly one of 50 overlapping booking requests, spread over both servers, the slot', async () => {
    const bench = await bookingBench(first.baseUrl)
    const onSecond = await signedIn('member@example.test', undefined, second.baseUrl)
    const jobs: number[] = []
    for (let batch = 0; batch < 5; batch++) jobs.push(...(await Promise.all(Array.from({ length: 10 }, (_, i) => bench.approvedJob(`Two-server race ${batch * 10 + i}`)))))
    const start = bench.at(9, '12:00')
    const responses = await Promise.all(jobs.map((jobId, i) => (i % 2 === 0 ? bench.member : onSecond).post('/api/bookings', { jobId, cutterId: bench.cutterId, start })))
    const statuses = responses.map((r) => r.status)
    expect(statuses.filter((status) => status === 201)).toHaveLength(1)
    expect(statuses.filter((status) => status === 409)).toHaveLength(49)
    const clashes = await sqlRow<{ n: number }>(
      `select count(*) as n from bookings a join bookings b on a.cutter_id = b.cutter_id and a.id < b.id
       where a.status <> 'cancelled' and b.status <> 'cancelled' and a.starts_at < b.ends_at and a.ends_at > b.starts_at`,
      [],
      first.databaseLocation,
    )
    expect(clashes!.n).toBe(0)
  })
})
