import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('jobs', (t) => {
    // Machine minutes actually cut, logged by staff when the job is finished.
    t.float('actual_minutes')
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('jobs', (t) => t.dropColumn('actual_minutes'))
}
