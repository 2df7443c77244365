// npm run db:seed-history -- --jobs 10000 [--days 731] [--seed 1] [--members 200] [--bookings 50000] [--database file.sqlite | postgres://…]
// Adds years of invented history to the demo workshop (migrated and seeded first if the database is new); run again, it adds more.
import { parseArgs } from 'node:util'
import { migrateLatest, openDatabase, seedDemoIfEmpty } from '../db/index'
import { databaseLocation } from '../db/knexfile'
import { seedHistory } from '../db/seeds/history'

const { values } = parseArgs({
  options: {
    jobs: { type: 'string', default: '10000' },
    days: { type: 'string', default: '731' },
    seed: { type: 'string', default: '20261204' },
    members: { type: 'string' },
    bookings: { type: 'string' },
    database: { type: 'string' },
  },
})
const count = (name: string, value: string | undefined) => {
  if (value === undefined) return undefined
  const n = Number(value)
  if (!Number.isInteger(n) || n < 0) {
    console.error(`--${name} takes a whole number, not "${value}"`)
    process.exit(2)
  }
  return n
}

const db = openDatabase(values.database ?? databaseLocation())
try {
  await migrateLatest(db)
  await seedDemoIfEmpty(db)
  const started = performance.now()
  const counts = await seedHistory(db, { jobs: count('jobs', values.jobs)!, days: count('days', values.days)!, seed: count('seed', values.seed), members: count('members', values.members), bookings: count('bookings', values.bookings) })
  console.log(`History seeded in ${((performance.now() - started) / 1000).toFixed(1)} s:`, Object.entries(counts).map(([k, v]) => `${v} ${k}`).join(', '))
} finally {
  await db.destroy()
}
