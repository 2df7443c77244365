import type { Knex } from 'knex'
import { timestamps } from '../schema-helpers'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('users', (t) => {
    t.increments('id')
    t.string('email').notNullable().unique()
    t.string('name').notNullable()
    t.string('password_hash').notNullable()
    t.string('role').notNullable().defaultTo('member')
    t.string('email_verified_at')
    t.string('disabled_at')
    timestamps(knex, t)
  })
  await knex.schema.createTable('auth_tokens', (t) => {
    t.increments('id')
    t.integer('user_id').notNullable().references('users.id').onDelete('CASCADE')
    t.string('purpose').notNullable()
    t.string('token_hash').notNullable().unique()
    t.string('expires_at').notNullable()
    t.string('used_at')
    timestamps(knex, t)
    t.index(['user_id', 'purpose'])
  })
  await knex.schema.createTable('settings', (t) => {
    t.string('key').primary()
    t.text('value_json').notNullable()
    timestamps(knex, t)
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('settings')
  await knex.schema.dropTable('auth_tokens')
  await knex.schema.dropTable('users')
}
