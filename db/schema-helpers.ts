import type { Knex } from 'knex'
import { utcNowSql } from './dialect'

/** A column default of "now" as UTC ISO-8601 text with milliseconds: 2026-12-01T21:47:42.123Z (either database). */
export function utcNowDefault(knex: Knex): Knex.Raw {
  return knex.raw(`(${utcNowSql(knex)})`)
}

/** created_at / updated_at on every table, stored as UTC ISO-8601 text. */
export function timestamps(knex: Knex, table: Knex.CreateTableBuilder): void {
  table.string('created_at').notNullable().defaultTo(utcNowDefault(knex))
  table.string('updated_at').notNullable().defaultTo(utcNowDefault(knex))
}
