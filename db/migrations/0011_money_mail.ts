import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('bookings', (t) => {
    // Set while a cancellation settles its payment; starting the cut is refused meanwhile (bookings.ts: claimCancellation).
    t.string('cancelling_since')
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('bookings', (t) => t.dropColumn('cancelling_since'))
}
