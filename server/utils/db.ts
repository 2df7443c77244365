import type { Knex } from 'knex'
import { migrateLatest, openDatabase } from '../../db/index'

let instance: Knex | undefined
let migrated: Promise<void> | undefined

/** The one Knex instance of this server process. */
export function useDb(): Knex {
  instance ??= openDatabase()
  return instance
}

/** Migrates once per process; every request waits for it (server/middleware/database.ts). */
export function databaseReady(): Promise<void> {
  migrated ??= migrateLatest(useDb())
  return migrated
}

/** Closes the database's connections as the server stops (a PostgreSQL pool would otherwise keep the process alive). */
export async function closeDatabase(): Promise<void> {
  const db = instance
  instance = undefined
  migrated = undefined
  await db?.destroy()
}
