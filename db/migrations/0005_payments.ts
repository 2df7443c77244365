import type { Knex } from 'knex'
import { timestamps } from '../schema-helpers'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('bookings', (t) => {
    // The estimate at booking time and the amount authorised on the card (estimate plus buffer), minor units.
    t.integer('estimate_minor')
    t.integer('authorised_minor')
    t.string('currency', 3)
    t.string('checkout_session_id')
    t.string('payment_intent_id')
  })
  // Every money event, as Stripe reported it. `ledger_key` makes each one count once, however often
  // and in whatever order the webhooks arrive: auth:<pi>, capture:<pi>, release:<pi>, refund:<re>, charge:<pi>.
  await knex.schema.createTable('payment_ledger', (t) => {
    t.increments('id')
    t.integer('booking_id').references('bookings.id')
    t.integer('job_id').references('jobs.id')
    t.integer('member_id').references('users.id')
    // authorised | captured | fee | released | refunded | charged
    t.string('kind').notNullable()
    t.integer('amount_minor').notNullable()
    t.string('currency', 3).notNullable()
    t.string('stripe_object_id').notNullable()
    t.string('ledger_key').notNullable().unique()
    t.text('note').notNullable().defaultTo('')
    timestamps(knex, t)
    t.index(['booking_id'])
    t.index(['member_id', 'created_at'])
  })
  await knex.schema.createTable('stripe_events', (t) => {
    t.string('id').primary()
    t.string('type').notNullable()
    timestamps(knex, t)
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('stripe_events')
  await knex.schema.dropTable('payment_ledger')
  for (const column of ['estimate_minor', 'authorised_minor', 'currency', 'checkout_session_id', 'payment_intent_id']) {
    await knex.schema.alterTable('bookings', (t) => t.dropColumn(column))
  }
}
