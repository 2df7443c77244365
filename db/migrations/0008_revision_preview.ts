import type { Knex } from 'knex'

// The preview geometry (every contour's points) is most of an analysis's size; kept in a column of its
// own, lists and estimates read the small figures without parsing it.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('file_revisions', (t) => {
    t.text('preview_json')
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('file_revisions', (t) => t.dropColumn('preview_json'))
}
