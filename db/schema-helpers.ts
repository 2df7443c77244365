import type { Knex } from 'knex'

/** UTC ISO-8601 with milliseconds, as SQLite writes it: 2026-12-01T21:47:42.123Z */
export const utcNowSql = "(strftime('%Y-%m-%dT%H:%M:%fZ','now'))"

/** created_at / updated_at on every table, stored as UTC ISO-8601 text. */
export function timestamps(knex: Knex, table: Knex.CreateTableBuilder): void {
  table.string('created_at').notNullable().defaultTo(knex.raw(utcNowSql))
  table.string('updated_at').notNullable().defaultTo(knex.raw(utcNowSql))
}
