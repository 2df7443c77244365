// The rules the database itself keeps, whatever the application does, on the database of this run (SQLite with
// `npm test`, PostgreSQL with `npm run test:postgres`): the bookings' overlap guard, the longest-booking keeper
// behind the calendar's lower bound, and the booking's payment state kept from the ledger. Rows are written
// straight into the tables here, past every service.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { isOverlapRefusal } from '../../server/utils/database-errors'
import { appDb, sqlRow, sqlRows } from './helpers'

let cutterId: number
let memberId: number
const written: number[] = []
let uidCounter = 0

// Far in the future, in a year of its own, so no other test's booking is near.
const at = (day: number, hour: number, minute = 0) => new Date(Date.UTC(2031, 2, day, hour, minute)).toISOString()

async function book(start: string, end: string, extra: Record<string, unknown> = {}): Promise<number> {
  const [row] = (await appDb()('bookings')
    .insert({ cutter_id: cutterId, kind: 'block', starts_at: start, ends_at: end, status: 'confirmed', ical_uid: `rules-${Date.now()}-${++uidCounter}@kerfbook`, ...extra })
    .returning('id')) as { id: number }[]
  written.push(row!.id)
  return row!.id
}

async function refusal(write: () => Promise<unknown>): Promise<unknown> {
  try {
    await write()
  } catch (error) {
    return error
  }
  return undefined
}

beforeAll(async () => {
  // A cutter of its own: the rules are per cutter.
  const [template] = await sqlRows('select * from cutters order by id limit 1')
  const { id: _id, name: _name, ...rest } = template
  const [row] = (await appDb()('cutters').insert({ ...rest, name: `Rules bench ${Date.now()}` }).returning('id')) as { id: number }[]
  cutterId = row!.id
  memberId = (await sqlRow<{ id: number }>("select id from users where email = 'member@example.test'"))!.id
})

afterAll(async () => {
  await appDb()('payment_ledger').whereIn('booking_id', written).del()
  await appDb()('bookings').whereIn('id', written).del()
})

describe('the database’s own rules', () => {
  it('refuses an overlapping live booking on the same cutter, recognised as an overlap by its error type', async () => {
    await book(at(3, 9), at(3, 10))
    const overlapping = await refusal(() => book(at(3, 9, 30), at(3, 10, 30)))
    expect(overlapping).toBeDefined()
    expect(isOverlapRefusal(overlapping)).toBe(true)
    const inside = await refusal(() => book(at(3, 9, 15), at(3, 9, 45)))
    expect(isOverlapRefusal(inside)).toBe(true)
    // Touching ends, a cancelled row, and a hold whose time to pay ran out all leave the time free.
    await book(at(3, 10), at(3, 11))
    await book(at(3, 9, 30), at(3, 10, 30), { status: 'cancelled' })
    await book(at(4, 9), at(4, 10), { status: 'held', hold_expires_at: '2000-01-01T00:00:00.000Z' })
    await book(at(4, 9, 30), at(4, 10, 30))
    // Moving a booking onto another is refused too.
    const later = await book(at(5, 9), at(5, 10))
    const moved = await refusal(() => appDb()('bookings').where({ id: later }).update({ starts_at: at(3, 9, 30), ends_at: at(3, 10, 30) }))
    expect(isOverlapRefusal(moved)).toBe(true)
    // A refusal of another kind (a unique id taken twice) is not an overlap.
    const sameUid = (day: number) => ({ cutter_id: cutterId, kind: 'block', starts_at: at(day, 9), ends_at: at(day, 10), status: 'confirmed', ical_uid: 'rules-dup@kerfbook' })
    await appDb()('bookings').insert(sameUid(6))
    const duplicate = await refusal(() => appDb()('bookings').insert(sameUid(7)))
    await appDb()('bookings').where({ ical_uid: 'rules-dup@kerfbook' }).del()
    expect(duplicate).toBeDefined()
    expect(isOverlapRefusal(duplicate)).toBe(false)
  })

  it('keeps the cutter’s longest booking as whole seconds longer than it, so the lower bound never cuts one off', async () => {
    // 26 h 0 min 0.5 s = 93 600.5 s: kept as 93 601, the first whole number of seconds past it.
    await book(at(10, 0), new Date(Date.parse(at(11, 2)) + 500).toISOString())
    const span = await sqlRow<{ longest_s: number }>('select longest_s from booking_spans where cutter_id = ?', [cutterId])
    expect(span!.longest_s).toBe(93_601)
    // A booking that began more than a day before still blocks a slot near its end.
    const nearEnd = await refusal(() => book(at(11, 1), at(11, 3)))
    expect(isOverlapRefusal(nearEnd)).toBe(true)
  })

  it('keeps the booking’s payment state from its ledger rows as they are written and removed', async () => {
    const id = await book(at(20, 9), at(20, 10), { kind: 'job', member_id: memberId })
    const state = async () => (await sqlRow<{ payment_state: string }>('select payment_state from bookings where id = ?', [id]))!.payment_state
    expect(await state()).toBe('awaiting')
    const ledger = (kind: string, amount: number) =>
      appDb()('payment_ledger').insert({ booking_id: id, member_id: memberId, kind, amount_minor: amount, currency: 'EUR', stripe_object_id: `pi_rules_${id}`, ledger_key: `rules:${kind}:${id}`, note: '' })
    await ledger('authorised', 5000)
    expect(await state()).toBe('authorised')
    await ledger('captured', 4200)
    expect(await state()).toBe('captured')
    await ledger('refunded', 1000)
    expect(await state()).toBe('partly-refunded')
    await appDb()('payment_ledger').where({ booking_id: id, kind: 'refunded' }).del()
    expect(await state()).toBe('captured')
  })
})
