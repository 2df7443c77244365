import { mkdirSync } from 'node:fs'
import { dirname, resolve } from 'node:path'
import type { Knex } from 'knex'
import { migrationSource } from './migrations'

/** The database file: DATABASE_PATH, or data/kerfbook.sqlite under the working directory. */
export function databasePath(): string {
  return resolve(process.env.DATABASE_PATH || 'data/kerfbook.sqlite')
}

/** One Knex config for the server and the CLI, so both open the database the same way. */
export function knexConfig(filename = databasePath()): Knex.Config {
  if (filename !== ':memory:') mkdirSync(dirname(filename), { recursive: true })
  return {
    client: 'better-sqlite3',
    connection: { filename },
    useNullAsDefault: true,
    // better-sqlite3 is synchronous: one connection serialises writers without SQLITE_BUSY surprises.
    pool: {
      min: 1,
      max: 1,
      afterCreate(connection: { pragma: (sql: string) => unknown }, done: (error: Error | null, connection: unknown) => void) {
        connection.pragma('journal_mode = WAL')
        connection.pragma('foreign_keys = ON')
        connection.pragma('busy_timeout = 5000')
        done(null, connection)
      },
    },
    migrations: { migrationSource, tableName: 'knex_migrations' },
  }
}
