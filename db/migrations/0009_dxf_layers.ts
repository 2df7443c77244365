import type { Knex } from 'knex'
import { timestamps } from '../schema-helpers'

// The workshop's DXF layer names and what each one means, checked before the colour mapping.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('dxf_layer_operations', (t) => {
    t.increments('id')
    t.string('layer').notNullable().unique()
    t.string('operation').notNullable()
    timestamps(knex, t)
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('dxf_layer_operations')
}
