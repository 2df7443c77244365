import Database from 'better-sqlite3'

/**
 * A write SQLite refused from a trigger (`RAISE(ABORT, …)`), recognised by better-sqlite3's error class and code,
 * never by the message (Knex prefixes it with the query).
 */
export function isTriggerRefusal(error: unknown): error is Database.SqliteError {
  return error instanceof Database.SqliteError && error.code === 'SQLITE_CONSTRAINT_TRIGGER'
}
