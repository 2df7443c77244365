import type { Knex } from 'knex'
import { timestamps } from '../schema-helpers'

// The overlap rule lives in the database too: whatever the application does, two live bookings on one
// cutter can't share a minute. Instants are UTC ISO-8601 strings of one format, so text order is time order.
const overlapGuard = (event: 'INSERT' | 'UPDATE') => `
CREATE TRIGGER bookings_no_overlap_${event.toLowerCase()} BEFORE ${event} ON bookings
WHEN NEW.status != 'cancelled' AND EXISTS (
  SELECT 1 FROM bookings b
  WHERE b.cutter_id = NEW.cutter_id AND b.status != 'cancelled' AND b.id IS NOT NEW.id
    AND b.starts_at < NEW.ends_at AND b.ends_at > NEW.starts_at
    AND (b.hold_expires_at IS NULL OR b.hold_expires_at > strftime('%Y-%m-%dT%H:%M:%fZ','now'))
)
BEGIN SELECT RAISE(ABORT, 'booking_overlap'); END;`

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('bookings', (t) => {
    t.increments('id')
    t.integer('cutter_id').notNullable().references('cutters.id')
    // A job booking has a job and a member; a staff block has neither.
    t.integer('job_id').references('jobs.id')
    t.integer('member_id').references('users.id')
    t.string('kind').notNullable().defaultTo('job')
    t.string('starts_at').notNullable()
    t.string('ends_at').notNullable()
    // held (awaiting payment) | confirmed | cancelled
    t.string('status').notNullable().defaultTo('confirmed')
    t.string('hold_expires_at')
    t.text('note').notNullable().defaultTo('')
    // RFC 5545: the UID stays, SEQUENCE goes up with every change.
    t.string('ical_uid').notNullable().unique()
    t.integer('ical_sequence').notNullable().defaultTo(0)
    t.integer('created_by').references('users.id')
    t.string('cancelled_at')
    t.text('cancel_reason')
    t.string('reminder_sent_at')
    timestamps(knex, t)
    t.index(['cutter_id', 'starts_at'])
    t.index(['member_id', 'starts_at'])
    t.index(['job_id'])
  })
  await knex.raw(overlapGuard('INSERT'))
  await knex.raw(overlapGuard('UPDATE'))
  await knex.schema.createTable('calendar_feeds', (t) => {
    t.increments('id')
    t.integer('user_id').notNullable().references('users.id').unique()
    t.string('token_hash', 64).notNullable().unique()
    timestamps(knex, t)
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TRIGGER IF EXISTS bookings_no_overlap_insert')
  await knex.raw('DROP TRIGGER IF EXISTS bookings_no_overlap_update')
  await knex.schema.dropTable('calendar_feeds')
  await knex.schema.dropTable('bookings')
}
