import type { Knex } from 'knex'
import { timestamps } from '../schema-helpers'

// One row per signed-in browser: the sealed cookie names its row, and a session whose row is gone has
// ended (sign-out, sign-out everywhere, a password change or reset, a role change).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('user_sessions', (t) => {
    t.string('id_hash').primary()
    t.integer('user_id').notNullable().references('users.id').onDelete('CASCADE')
    t.string('expires_at').notNullable()
    timestamps(knex, t)
    t.index(['user_id'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('user_sessions')
}
