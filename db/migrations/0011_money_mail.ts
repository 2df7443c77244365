import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('bookings', (t) => {
    // Set while a cancellation settles its payment; starting the cut is refused meanwhile (bookings.ts: claimCancellation).
    t.string('cancelling_since')
    // The latest checkout for a balance owed after the cut (payments.ts: openBalanceCheckout).
    t.string('balance_checkout_session_id')
    t.text('balance_checkout_url')
  })
}

export async function down(knex: Knex): Promise<void> {
  for (const column of ['cancelling_since', 'balance_checkout_session_id', 'balance_checkout_url']) {
    await knex.schema.alterTable('bookings', (t) => t.dropColumn(column))
  }
}
