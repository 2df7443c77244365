// npm run db:migrate | db:seed | db:reset — the same migrations and seeds the server uses.
import { databasePath } from '../db/knexfile'
import { migrateLatest, openDatabase, removeDatabaseFiles, seedDemoIfEmpty } from '../db/index'

const command = process.argv[2]
if (!['migrate', 'seed', 'reset'].includes(command ?? '')) {
  console.error('usage: tsx scripts/db.ts migrate|seed|reset')
  process.exit(2)
}
if (command === 'reset') removeDatabaseFiles()
const db = openDatabase()
try {
  await migrateLatest(db)
  if (command !== 'migrate') {
    const seeded = await seedDemoIfEmpty(db, { history: true })
    console.log(seeded ? 'Demo workshop seeded.' : 'Database already has users; seed skipped (use db:reset).')
  }
  console.log(`Database ready: ${databasePath()}`)
} finally {
  await db.destroy()
}
