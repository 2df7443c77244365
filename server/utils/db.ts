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
