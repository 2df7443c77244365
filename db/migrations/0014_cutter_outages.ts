import type { Knex } from 'knex'
import { isPostgres } from '../dialect'
import { timestamps } from '../schema-helpers'

// A cutter out of service for a period: booking refuses the period, and the bookings it called off point at it,
// so the member's overview can offer a new slot. The period ends at `ended_at` once staff put the cutter back,
// else at `expected_back_at`. And the unit each person reads lengths in (storage stays millimetres).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('cutter_outages', (t) => {
    t.increments('id')
    t.integer('cutter_id').notNullable().references('cutters.id')
    t.text('reason').notNullable()
    t.string('starts_at').notNullable()
    t.string('expected_back_at').notNullable()
    t.string('ended_at')
    t.integer('created_by').references('users.id')
    t.integer('ended_by').references('users.id')
    timestamps(knex, t)
    t.index(['cutter_id', 'starts_at'])
  })
  // SQLite: a plain ADD COLUMN. Knex adds a column with a foreign key by rebuilding the table, which drops the
  // table's triggers (the bookings' overlap guard among them); SQLite accepts REFERENCES on an added column whose
  // default is NULL, so no rebuild is needed.
  if (!isPostgres(knex)) {
    await knex.raw('ALTER TABLE bookings ADD COLUMN outage_id INTEGER REFERENCES cutter_outages(id)')
  } else {
    await knex.schema.alterTable('bookings', (t) => {
      t.integer('outage_id').references('cutter_outages.id')
    })
  }
  await knex.schema.alterTable('users', (t) => {
    // mm | in (shared/units.ts)
    t.string('length_unit').notNullable().defaultTo('mm')
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('users', (t) => t.dropColumn('length_unit'))
  await knex.schema.alterTable('bookings', (t) => t.dropColumn('outage_id'))
  await knex.schema.dropTable('cutter_outages')
}
