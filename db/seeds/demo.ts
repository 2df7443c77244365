import type { Knex } from 'knex'
import { seedDemoCatalog } from './demo-catalog'
import { seedHistory } from './history'

// The demo scenario is invented: Wrenfield Sheetworks, a community fabrication
// workshop in the fictional river town of Wrenfield. Every name here is made up.
export const DEMO_PASSWORD = 'kerfbook-demo'

export const demoUsers = [
  { email: 'admin@example.test', name: 'Odile Brannagh', role: 'admin' },
  { email: 'staff@example.test', name: 'Tomasz Wreay', role: 'staff' },
  { email: 'member@example.test', name: 'Juno Castellane', role: 'member' },
  { email: 'ines@example.test', name: 'Ines Halloway', role: 'member' },
  { email: 'reuben@example.test', name: 'Reuben Achterberg', role: 'member' },
  { email: 'priya@example.test', name: 'Priya Lomond', role: 'member' },
] as const

export const demoSettings = {
  workshopName: 'Wrenfield Sheetworks',
  workshopTown: 'Wrenfield',
  timeZone: 'Europe/Dublin',
  currency: 'EUR',
}

/** About six months of invented activity, so reports, the estimate-accuracy plot and the dashboards have something to show. */
export const DEMO_HISTORY = { jobs: 160, days: 182, members: 14, bookings: 260, seed: 20_260_601, withExistingMembers: true }

/**
 * Fills an empty database with the demo workshop. `hash` turns a password into a stored hash. With `history`, the
 * workshop has run for half a year (npm run dev, db:seed); without, it starts empty (the tests and benchmarks).
 * `now` (the clock by default) is the instant the workshop is seeded at, so two databases seeded with one `now` hold the same rows.
 */
export async function seedDemo(knex: Knex, hash: (password: string) => Promise<string>, options: { history?: boolean; now?: Date } = {}): Promise<void> {
  const passwordHash = await hash(DEMO_PASSWORD)
  const now = options.now ?? new Date()
  const verifiedAt = now.toISOString()
  await knex.transaction(async (trx) => {
    await trx('users').insert(demoUsers.map((u) => ({ ...u, password_hash: passwordHash, email_verified_at: verifiedAt })))
    await trx('settings').insert(
      Object.entries(demoSettings).map(([key, value]) => ({ key, value_json: JSON.stringify(value) })),
    )
    await seedDemoCatalog(trx, now)
  })
  if (options.history) await seedHistory(knex, { ...DEMO_HISTORY, now: options.now })
}
