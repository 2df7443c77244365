import type { Knex } from 'knex'
import { timestamps } from '../schema-helpers'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('bookings', (t) => {
    // Set while a cancellation settles its payment; starting the cut is refused meanwhile (bookings.ts: claimCancellation).
    t.string('cancelling_since')
    // The latest checkout for a balance owed after the cut (payments.ts: openBalanceCheckout).
    t.string('balance_checkout_session_id')
    t.text('balance_checkout_url')
  })
  // A finish under way: written before the card is captured, cleared when the finish commits. A server that stops
  // between the two leaves it, and the reconcile duty (operations.ts) completes the finish from Stripe's state.
  await knex.schema.alterTable('jobs', (t) => {
    t.float('finishing_minutes')
    t.text('finishing_comment')
    t.integer('finishing_by').references('users.id')
    t.string('finishing_since')
  })
  // The transactional outbox: a mail is a row written with the change it reports; a background sender delivers it.
  await knex.schema.createTable('mail_outbox', (t) => {
    t.increments('id')
    t.string('recipient').notNullable()
    t.string('subject').notNullable()
    // The whole message (paragraphs, action, attachments) as JSON; rendered when sent.
    t.text('message_json').notNullable()
    // pending → sending → sent; or, after the last attempt fails, dead (staff see it and may send it again).
    t.string('status').notNullable().defaultTo('pending')
    t.integer('attempts').notNullable().defaultTo(0)
    t.string('next_attempt_at').notNullable()
    t.string('claimed_at')
    t.text('last_error')
    t.string('sent_at')
    timestamps(knex, t)
    t.index(['status', 'next_attempt_at'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('mail_outbox')
  for (const column of ['finishing_minutes', 'finishing_comment', 'finishing_by', 'finishing_since']) {
    await knex.schema.alterTable('jobs', (t) => t.dropColumn(column))
  }
  for (const column of ['cancelling_since', 'balance_checkout_session_id', 'balance_checkout_url']) {
    await knex.schema.alterTable('bookings', (t) => t.dropColumn(column))
  }
}
