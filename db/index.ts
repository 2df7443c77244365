import { rmSync } from 'node:fs'
import knex, { type Knex } from 'knex'
import { databasePath, knexConfig } from './knexfile'
import { seedDemo } from './seeds/demo'
import { hashPasswordOffline } from './password-hash'

export function openDatabase(filename = databasePath()): Knex {
  return knex(knexConfig(filename))
}

export async function migrateLatest(db: Knex): Promise<void> {
  await db.migrate.latest()
}

/** Seeds the demo workshop only when the database has no users yet, so a re-run never duplicates it; `history` adds its half year of activity. */
export async function seedDemoIfEmpty(db: Knex, options: { history?: boolean } = {}): Promise<boolean> {
  const row = await db('users').count<{ n: number }[]>({ n: '*' }).first()
  if (Number(row?.n ?? 0) > 0) return false
  await seedDemo(db, hashPasswordOffline, options)
  return true
}

export function removeDatabaseFiles(filename = databasePath()): void {
  for (const suffix of ['', '-wal', '-shm']) rmSync(filename + suffix, { force: true })
}
