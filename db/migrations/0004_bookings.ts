import type { Knex } from 'knex'
import { BOOKING_WRITE_LOCK, isPostgres } from '../dialect'
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

// PostgreSQL: the same rule as one trigger function. It first takes the lock every booking write takes
// (server/services/bookings.ts), so two transactions can't both check, find the time free and insert: the
// second waits, and its check (a fresh snapshot, READ COMMITTED) sees the first's row. SQLite needs no lock:
// it has one writer at a time. A row whose time, cutter, status and hold are unchanged is not checked again (SQLite's
// trigger re-checks every update of a live row, a payment-state change included; skipping those here is intended: a
// ledger write then never waits for the booking lock while holding the booking's row).
export const postgresOverlapGuard = (lowerBound: string) => `
CREATE OR REPLACE FUNCTION bookings_no_overlap() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF NEW.status = 'cancelled' THEN RETURN NEW; END IF;
  IF TG_OP = 'UPDATE' AND NEW.cutter_id = OLD.cutter_id AND NEW.starts_at = OLD.starts_at AND NEW.ends_at = OLD.ends_at
    AND NEW.status = OLD.status AND NEW.hold_expires_at IS NOT DISTINCT FROM OLD.hold_expires_at THEN RETURN NEW; END IF;
  PERFORM pg_advisory_xact_lock(${BOOKING_WRITE_LOCK});
  IF EXISTS (
    SELECT 1 FROM bookings b
    WHERE b.cutter_id = NEW.cutter_id AND b.status <> 'cancelled' AND b.id <> NEW.id
      AND b.starts_at < NEW.ends_at AND b.ends_at > NEW.starts_at${lowerBound}
      AND (b.hold_expires_at IS NULL OR b.hold_expires_at > to_char(clock_timestamp() AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"'))
  ) THEN
    RAISE EXCEPTION 'booking_overlap' USING ERRCODE = 'exclusion_violation';
  END IF;
  RETURN NEW;
END $$`

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
  if (isPostgres(knex)) {
    await knex.raw(postgresOverlapGuard(''))
    await knex.raw('CREATE TRIGGER bookings_no_overlap BEFORE INSERT OR UPDATE ON bookings FOR EACH ROW EXECUTE FUNCTION bookings_no_overlap()')
  } else {
    await knex.raw(overlapGuard('INSERT'))
    await knex.raw(overlapGuard('UPDATE'))
  }
  await knex.schema.createTable('calendar_feeds', (t) => {
    t.increments('id')
    t.integer('user_id').notNullable().references('users.id').unique()
    t.string('token_hash', 64).notNullable().unique()
    timestamps(knex, t)
  })
}

export async function down(knex: Knex): Promise<void> {
  if (isPostgres(knex)) {
    await knex.raw('DROP TRIGGER IF EXISTS bookings_no_overlap ON bookings')
    await knex.raw('DROP FUNCTION IF EXISTS bookings_no_overlap()')
  } else {
    await knex.raw('DROP TRIGGER IF EXISTS bookings_no_overlap_insert')
    await knex.raw('DROP TRIGGER IF EXISTS bookings_no_overlap_update')
  }
  await knex.schema.dropTable('calendar_feeds')
  await knex.schema.dropTable('bookings')
}
