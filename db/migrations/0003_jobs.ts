import type { Knex } from 'knex'
import { timestamps } from '../schema-helpers'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('jobs', (t) => {
    t.increments('id')
    t.integer('member_id').notNullable().references('users.id')
    t.string('title').notNullable()
    t.integer('cutter_id').notNullable().references('cutters.id')
    t.integer('material_id').notNullable().references('materials.id')
    t.integer('sheet_id').notNullable().references('material_sheets.id')
    t.text('notes').notNullable().defaultTo('')
    // Stable state codes; server/services/job-states.ts holds the transitions.
    t.string('state').notNullable().defaultTo('draft')
    // The member's note on the warnings they accept, saved at submission.
    t.text('warnings_acknowledgement')
    // Staff may let one job through a limit, with the reason recorded.
    t.text('override_reason')
    t.integer('override_by').references('users.id')
    t.string('submitted_at')
    timestamps(knex, t)
    t.index(['member_id', 'state'])
    t.index(['state', 'submitted_at'])
  })
  await knex.schema.createTable('job_files', (t) => {
    t.increments('id')
    t.integer('job_id').notNullable().references('jobs.id').onDelete('CASCADE')
    t.string('name').notNullable()
    t.integer('quantity').notNullable().defaultTo(1)
    t.string('removed_at')
    timestamps(knex, t)
    t.index(['job_id'])
  })
  await knex.schema.createTable('file_revisions', (t) => {
    t.increments('id')
    t.integer('job_file_id').notNullable().references('job_files.id').onDelete('CASCADE')
    t.integer('revision').notNullable()
    // Content address of the stored file under data/uploads/.
    t.string('sha256', 64).notNullable()
    t.string('original_name').notNullable()
    t.integer('size_bytes').notNullable()
    t.string('content_type').notNullable()
    // The engine's result for this revision with the job's process, kept as it was computed.
    t.text('analysis_json').notNullable()
    t.string('worst_severity')
    t.integer('uploaded_by').notNullable().references('users.id')
    timestamps(knex, t)
    t.unique(['job_file_id', 'revision'])
    t.index(['sha256'])
  })
  await knex.schema.createTable('job_events', (t) => {
    t.increments('id')
    t.integer('job_id').notNullable().references('jobs.id').onDelete('CASCADE')
    t.integer('actor_id').references('users.id')
    t.string('from_state')
    t.string('to_state').notNullable()
    t.text('comment').notNullable().defaultTo('')
    // Optional pointer at a finding: {fileId, revision, index}.
    t.text('finding_ref_json')
    timestamps(knex, t)
    t.index(['job_id'])
  })
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ['job_events', 'file_revisions', 'job_files', 'jobs']) await knex.schema.dropTable(table)
}
