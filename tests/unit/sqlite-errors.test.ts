// Booking overlaps that slip past the application are refused by the database trigger of migration 0004;
// the service recognises that refusal by the driver's error class and code.
import knex, { type Knex } from 'knex'
import { afterEach, describe, expect, it } from 'vitest'
import { migrationSource } from '../../db/migrations/index'
import { isOverlapRefusal } from '../../server/utils/database-errors'

let db: Knex | undefined

afterEach(async () => {
  await db?.destroy()
  db = undefined
})

/** A memory database migrated up to and including `last` (all of them without it). */
async function memoryDb(last?: string): Promise<Knex> {
  db = knex({ client: 'better-sqlite3', connection: { filename: ':memory:' }, useNullAsDefault: true, pool: { min: 1, max: 1 }, migrations: { migrationSource } })
  for (const name of await migrationSource.getMigrations([])) {
    await db.migrate.up({ name })
    if (name === last) break
  }
  // Bookings alone, without the cutter and users they point to (one connection, so the pragma holds).
  await db.raw('PRAGMA foreign_keys = OFF')
  return db
}

const booking = (uid: string, startsAt: string, endsAt: string) => ({ cutter_id: 1, kind: 'block', starts_at: startsAt, ends_at: endsAt, status: 'confirmed', ical_uid: uid })
const overlapTriggers = async (db: Knex) => (await db.raw("SELECT name FROM sqlite_master WHERE type = 'trigger' AND name LIKE 'bookings_no_overlap_%'")).length

describe('isOverlapRefusal', () => {
  it('recognises the overlap trigger refusing a second booking of the same minutes', async () => {
    const db = await memoryDb()
    await db('bookings').insert(booking('a@test', '2026-12-01T09:00:00.000Z', '2026-12-01T10:00:00.000Z'))
    const error = await db('bookings').insert(booking('b@test', '2026-12-01T09:30:00.000Z', '2026-12-01T10:30:00.000Z')).catch((e: unknown) => e)
    expect(isOverlapRefusal(error)).toBe(true)
  })

  it('does not take other constraint failures or plain errors for a trigger refusal', async () => {
    const db = await memoryDb()
    await db('bookings').insert(booking('a@test', '2026-12-01T09:00:00.000Z', '2026-12-01T10:00:00.000Z'))
    // The same iCalendar UID again, at another time: a UNIQUE constraint, not the trigger.
    const unique = await db('bookings').insert(booking('a@test', '2026-12-02T09:00:00.000Z', '2026-12-02T10:00:00.000Z')).catch((e: unknown) => e)
    expect(unique).toBeInstanceOf(Error)
    expect(isOverlapRefusal(unique)).toBe(false)
    expect(isOverlapRefusal(new Error('booking_overlap'))).toBe(false)
  })

  // Knex adds a column with a foreign key on SQLite by rebuilding the table, which drops its triggers.
  it('keeps the overlap triggers after every migration', async () => {
    expect(await overlapTriggers(await memoryDb())).toBe(2)
  })
})
