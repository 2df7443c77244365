// npm run db:migrate | db:seed | db:reset — the same migrations and seeds the server uses, on the same database
// (DATABASE_URL for PostgreSQL, else the SQLite file at DATABASE_PATH).
import { databaseLocation, describeLocation, isPostgresUrl } from '../db/knexfile'
import { migrateLatest, openDatabase, removeDatabaseFiles, seedDemoIfEmpty } from '../db/index'

const command = process.argv[2]
if (!['migrate', 'seed', 'reset'].includes(command ?? '')) {
  console.error('usage: tsx scripts/db.ts migrate|seed|reset')
  process.exit(2)
}
const location = databaseLocation()
if (command === 'reset' && !isPostgresUrl(location)) removeDatabaseFiles(location)
const db = openDatabase(location)
try {
  // PostgreSQL: everything in the database's schema goes, tables, trigger functions and the migration record alike.
  if (command === 'reset' && isPostgresUrl(location)) await db.raw('DROP SCHEMA public CASCADE; CREATE SCHEMA public')
  await migrateLatest(db)
  if (command !== 'migrate') {
    const seeded = await seedDemoIfEmpty(db, { history: true })
    console.log(seeded ? 'Demo workshop seeded.' : 'Database already has users; seed skipped (use db:reset).')
  }
  console.log(`Database ready: ${describeLocation(location)}`)
} finally {
  await db.destroy()
}
