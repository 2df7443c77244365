import type { Knex } from 'knex'
import { timestamps } from '../schema-helpers'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('jobs', (t) => {
    // Recorded when the cut is finished, so reports and calibration read what was known then.
    t.float('estimated_minutes')
    t.float('estimated_cut_s')
    t.float('estimated_pierce_s')
    t.float('estimated_travel_s')
    t.float('estimated_setup_s')
    t.integer('sheets_used')
    t.string('cut_finished_at')
    // Collection: where the parts wait, the one-time code, and when they left.
    t.string('pickup_location')
    t.string('pickup_code')
    t.string('ready_at')
    t.string('collected_at')
    t.string('pickup_reminded_at')
  })
  await knex.schema.alterTable('bookings', (t) => {
    t.text('checkout_url')
  })
  // The cutting timer: server timestamps, so a closed browser loses nothing.
  await knex.schema.createTable('cut_timer_events', (t) => {
    t.increments('id')
    t.integer('job_id').notNullable().references('jobs.id')
    t.string('kind').notNullable() // start | pause | resume | finish
    t.string('at').notNullable()
    t.integer('actor_id').references('users.id')
    timestamps(knex, t)
    t.index(['job_id'])
  })
  await knex.schema.createTable('cut_problems', (t) => {
    t.increments('id')
    t.integer('job_id').notNullable().references('jobs.id')
    t.string('kind').notNullable() // failed-cut | re-cut | material-defect | other
    t.text('note').notNullable()
    t.integer('actor_id').references('users.id')
    timestamps(knex, t)
    t.index(['job_id'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('cut_problems')
  await knex.schema.dropTable('cut_timer_events')
  await knex.schema.alterTable('bookings', (t) => t.dropColumn('checkout_url'))
  for (const column of ['estimated_minutes', 'estimated_cut_s', 'estimated_pierce_s', 'estimated_travel_s', 'estimated_setup_s', 'sheets_used', 'cut_finished_at', 'pickup_location', 'pickup_code', 'ready_at', 'collected_at', 'pickup_reminded_at']) {
    await knex.schema.alterTable('jobs', (t) => t.dropColumn(column))
  }
}
