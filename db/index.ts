import { rmSync } from 'node:fs'
import knex, { type Knex } from 'knex'
import { isPostgres, MIGRATION_LOCK } from './dialect'
import { databaseLocation, databasePath, isPostgresUrl, knexConfig } from './knexfile'
import { seedDemo } from './seeds/demo'
import { hashPasswordOffline } from './password-hash'

/** Opens the database at `location`: a SQLite file (the default) or a postgres:// URL (db/knexfile.ts). */
export function openDatabase(location = databaseLocation()): Knex {
  return knex(knexConfig(location))
}

/**
 * Brings the schema up to date. On PostgreSQL several app servers may start at once: the first to take the
 * migration lock migrates, the others wait for it and then find nothing left to do (Knex's own lock table would
 * make them fail instead).
 */
export async function migrateLatest(db: Knex): Promise<void> {
  if (!isPostgres(db)) {
    await db.migrate.latest()
    return
  }
  await db.transaction(async (trx) => {
    await trx.raw('SELECT pg_advisory_xact_lock(?)', [MIGRATION_LOCK])
    await db.migrate.latest()
  })
}

/** Seeds the demo workshop only when the database has no users yet, so a re-run never duplicates it; `history` adds its half year of activity. */
export async function seedDemoIfEmpty(db: Knex, options: { history?: boolean } = {}): Promise<boolean> {
  const row = await db('users').count<{ n: number }[]>({ n: '*' }).first()
  if (Number(row?.n ?? 0) > 0) return false
  await seedDemo(db, hashPasswordOffline, options)
  return true
}

/** Deletes the SQLite file and its journals (a PostgreSQL database is dropped by its owner, not here). */
export function removeDatabaseFiles(filename = databasePath()): void {
  if (isPostgresUrl(filename)) throw new Error('removeDatabaseFiles is for SQLite files')
  for (const suffix of ['', '-wal', '-shm']) rmSync(filename + suffix, { force: true })
}
