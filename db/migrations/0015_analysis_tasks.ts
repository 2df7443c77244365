import type { Knex } from 'knex'
import { timestamps } from '../schema-helpers'

// Analyses handed to worker machines through the database (ANALYSIS_ROLE, server/utils/analysis-remote.ts): the
// app server that took the upload writes a task, a worker claims it, runs it and writes the outcome back, and the
// app server reads it and deletes the row. Used with PostgreSQL only; the table stays empty on SQLite.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('analysis_tasks', (t) => {
    t.increments('id')
    // queued | running | done | failed
    t.string('status').notNullable().defaultTo('queued')
    t.text('label').notNullable()
    t.text('input_text').notNullable()
    // { params, format }
    t.text('params_json').notNullable()
    t.string('stage')
    t.string('claimed_by')
    t.string('heartbeat_at')
    t.text('result_json')
    t.binary('geometry_gz')
    t.binary('sites_gz')
    // { message, status, details }
    t.text('error_json')
    timestamps(knex, t)
    t.index(['status', 'id'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('analysis_tasks')
}
