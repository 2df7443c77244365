// What differs between the two databases Kerfbook runs on, in one place: SQLite (the embedded default) and
// PostgreSQL (DATABASE_URL, for a group of workshops sharing one database). Services stay dialect-free; the
// few statements that must differ ask here.
import type { Knex } from 'knex'

/**
 * PostgreSQL: the transaction-scoped advisory lock every booking write holds (the booking services and the overlap
 * trigger of migration 0004), so booking rules are checked and written one transaction at a time, as on SQLite.
 */
export const BOOKING_WRITE_LOCK = 5_045_001

/** PostgreSQL: held while one app server migrates (db/index.ts migrateLatest). */
export const MIGRATION_LOCK = 5_045_003

export function isPostgres(db: Knex): boolean {
  return db.client.dialect === 'postgresql'
}

/** SQL for "now" as UTC ISO-8601 text with milliseconds, the one format every instant is stored in: 2026-12-01T21:47:42.123Z */
export function utcNowSql(db: Knex): string {
  return isPostgres(db) ? `to_char(clock_timestamp() AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"')` : `strftime('%Y-%m-%dT%H:%M:%fZ','now')`
}

/** SQL for the instant `seconds` before now, in the same text form (both databases' own clock). */
export function utcSecondsAgoSql(db: Knex, seconds: number): string {
  if (!Number.isFinite(seconds)) throw new Error('seconds must be a number')
  return isPostgres(db)
    ? `to_char((clock_timestamp() - make_interval(secs => ${seconds})) AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"')`
    : `strftime('%Y-%m-%dT%H:%M:%fZ', 'now', '-${seconds} seconds')`
}

/** Inserts one row and answers its new id (SQLite and PostgreSQL both support RETURNING). */
export async function insertedId(query: Knex.QueryBuilder): Promise<number> {
  const [row] = (await query.returning('id')) as { id: number }[]
  return row!.id
}

/**
 * After rows were written with explicit ids (the seeds), PostgreSQL's id sequences still start at 1; this moves each
 * past the largest id, so the next ordinary insert gets a fresh one. SQLite needs nothing: it takes max(id) + 1.
 */
export async function syncIdSequences(db: Knex): Promise<void> {
  if (!isPostgres(db)) return
  const tables = await db.raw<{ rows: { table_name: string }[] }>(
    `SELECT table_name FROM information_schema.columns WHERE table_schema = current_schema() AND column_name = 'id' AND column_default LIKE 'nextval(%'`,
  )
  for (const { table_name: table } of tables.rows) {
    await db.raw(`SELECT setval(pg_get_serial_sequence(?, 'id'), coalesce((SELECT max(id) FROM ??), 0) + 1, false)`, [table, table])
  }
}
