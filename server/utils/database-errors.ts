import Database from 'better-sqlite3'
import pg from 'pg'

/**
 * A booking write the database refused because it overlaps another (the overlap trigger of migrations 0004 and
 * 0013), recognised by the driver's error class and code, never by the message (Knex prefixes it with the query):
 * SQLite's `RAISE(ABORT, …)` from a trigger, or PostgreSQL's exclusion_violation (SQLSTATE 23P01) raised by the
 * trigger function.
 */
export function isOverlapRefusal(error: unknown): boolean {
  if (error instanceof Database.SqliteError) return error.code === 'SQLITE_CONSTRAINT_TRIGGER'
  return error instanceof pg.DatabaseError && error.code === '23P01'
}
