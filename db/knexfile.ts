import { mkdirSync } from 'node:fs'
import { dirname, resolve } from 'node:path'
import type { Knex } from 'knex'
import { migrationSource } from './migrations'
import { PostgresClient } from './postgres-client'

/** The database file: DATABASE_PATH, or data/kerfbook.sqlite under the working directory. */
export function databasePath(): string {
  return resolve(process.env.DATABASE_PATH || 'data/kerfbook.sqlite')
}

/** Where the data lives: DATABASE_URL when it names a PostgreSQL server, else the SQLite file (databasePath). */
export function databaseLocation(): string {
  const url = process.env.DATABASE_URL
  return url && isPostgresUrl(url) ? url : databasePath()
}

export function isPostgresUrl(location: string): boolean {
  return /^postgres(ql)?:\/\//.test(location)
}

/** A location as people may read it: the file, or the server and database without the password. */
export function describeLocation(location = databaseLocation()): string {
  if (!isPostgresUrl(location)) return location
  const url = new URL(location)
  url.password = url.password ? '***' : ''
  return url.toString()
}

/** One Knex config for the server and the CLI, so both open the database the same way: a SQLite file or a postgres:// URL. */
export function knexConfig(location = databaseLocation()): Knex.Config {
  const migrations = { migrationSource, tableName: 'knex_migrations' }
  if (isPostgresUrl(location)) {
    return {
      client: PostgresClient as unknown as typeof Knex.Client,
      connection: { connectionString: location },
      // Each app server holds a few connections. A background duty (one at a time) and a migration each hold one for
      // their lock while they work on another, so the pool never has fewer than two.
      pool: { min: 0, max: Math.max(2, Number(process.env.DATABASE_POOL_MAX) || 10) },
      migrations,
    }
  }
  if (location !== ':memory:') mkdirSync(dirname(location), { recursive: true })
  return {
    client: 'better-sqlite3',
    connection: { filename: location },
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
    migrations,
  }
}
