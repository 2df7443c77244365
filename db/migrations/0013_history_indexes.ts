import type { Knex } from 'knex'
import { isPostgres } from '../dialect'
import { postgresOverlapGuard } from './0004_bookings'

// Years of history: the reports find their rows by time through indexes, and every read of a cutter's
// bookings round a time (the calendar, the clash check, the overlap trigger) gets a lower bound on
// `starts_at` as well as the upper one, so it walks only the bookings near that time, not the cutter's past.
// The bound is `start − the longest booking the cutter ever had`: a booking that ends after `start` began
// after it. `booking_spans` keeps that longest length per cutter, raised by triggers on every write.

const NOW = "strftime('%Y-%m-%dT%H:%M:%fZ','now')"
// Whole seconds, rounded up (and a second more, so floating-point day fractions never make it short).
const spanSeconds = (row: string) => `CAST((julianday(${row}.ends_at) - julianday(${row}.starts_at)) * 86400 + 1 AS INTEGER)`

const overlapGuard = (event: 'INSERT' | 'UPDATE', bounded: boolean) => `
CREATE TRIGGER bookings_no_overlap_${event.toLowerCase()} BEFORE ${event} ON bookings
WHEN NEW.status != 'cancelled' AND EXISTS (
  SELECT 1 FROM bookings b
  WHERE b.cutter_id = NEW.cutter_id AND b.status != 'cancelled' AND b.id IS NOT NEW.id
    AND b.starts_at < NEW.ends_at AND b.ends_at > NEW.starts_at${
      bounded
        ? `
    AND b.starts_at > strftime('%Y-%m-%dT%H:%M:%fZ', NEW.starts_at, '-' || coalesce((SELECT s.longest_s FROM booking_spans s WHERE s.cutter_id = NEW.cutter_id), 0) || ' seconds')`
        : ''
    }
    AND (b.hold_expires_at IS NULL OR b.hold_expires_at > ${NOW})
)
BEGIN SELECT RAISE(ABORT, 'booking_overlap'); END;`

const spanKeeper = (event: 'INSERT' | 'UPDATE') => `
CREATE TRIGGER bookings_span_${event.toLowerCase()} AFTER ${event === 'INSERT' ? 'INSERT' : 'UPDATE OF cutter_id, starts_at, ends_at'} ON bookings
BEGIN
  INSERT INTO booking_spans (cutter_id, longest_s) VALUES (NEW.cutter_id, ${spanSeconds('NEW')})
  ON CONFLICT (cutter_id) DO UPDATE SET longest_s = max(longest_s, excluded.longest_s);
END;`

// A booking's payment state as a column, so the payments list filters by it through an index instead of summing
// the whole ledger per request. Kept by triggers on the ledger; the rule is payments.ts `paymentStateOf`, frozen
// here as this migration writes it (tests/unit/history/volume.test.ts checks the two agree).
const sumOf = (kinds: string[]) => `coalesce(sum(case when l.kind in (${kinds.map((k) => `'${k}'`).join(', ')}) then l.amount_minor else 0 end), 0)`
const paymentStateOf = (bookingId: string) => `(SELECT CASE
    WHEN s.owed > s.charged THEN 'balance-due'
    WHEN s.refunded > 0 THEN (CASE WHEN s.refunded >= s.captured THEN 'refunded' ELSE 'partly-refunded' END)
    WHEN s.captured > 0 THEN 'captured'
    WHEN s.releases > 0 THEN 'released'
    WHEN s.authorised > 0 THEN 'authorised'
    ELSE 'awaiting' END
  FROM (SELECT ${sumOf(['authorised'])} AS authorised, ${sumOf(['captured', 'fee', 'charged'])} AS captured, ${sumOf(['refunded'])} AS refunded,
    ${sumOf(['owed'])} AS owed, ${sumOf(['charged'])} AS charged, coalesce(sum(case when l.kind = 'released' then 1 else 0 end), 0) AS releases
    FROM payment_ledger l WHERE l.booking_id = ${bookingId}) s)`
const stateKeeper = (event: 'INSERT' | 'UPDATE' | 'DELETE') => {
  const row = event === 'DELETE' ? 'OLD' : 'NEW'
  return `
CREATE TRIGGER payment_ledger_state_${event.toLowerCase()} AFTER ${event} ON payment_ledger WHEN ${row}.booking_id IS NOT NULL
BEGIN
  UPDATE bookings SET payment_state = ${paymentStateOf(`${row}.booking_id`)} WHERE id = ${row}.booking_id;
END;`
}

// PostgreSQL: the same keepers as trigger functions; instants are the same ISO text, turned into timestamps to
// subtract and back into text to compare.
// The length's whole seconds and one more, as SQLite's: never short of the length (the bound is strict).
const spanSecondsPg = (row: string) => `(floor(extract(epoch FROM (${row}.ends_at::timestamptz - ${row}.starts_at::timestamptz)))::integer + 1)`
const postgresKeepers = `
CREATE FUNCTION bookings_span() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  INSERT INTO booking_spans (cutter_id, longest_s) VALUES (NEW.cutter_id, ${spanSecondsPg('NEW')})
  ON CONFLICT (cutter_id) DO UPDATE SET longest_s = greatest(booking_spans.longest_s, excluded.longest_s);
  RETURN NULL;
END $$;
CREATE TRIGGER bookings_span AFTER INSERT OR UPDATE OF cutter_id, starts_at, ends_at ON bookings FOR EACH ROW EXECUTE FUNCTION bookings_span();
CREATE FUNCTION payment_ledger_state() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE target integer;
BEGIN
  IF TG_OP = 'DELETE' THEN target := OLD.booking_id; ELSE target := NEW.booking_id; END IF;
  IF target IS NOT NULL THEN
    UPDATE bookings SET payment_state = ${paymentStateOf('target')} WHERE id = target;
  END IF;
  RETURN NULL;
END $$;
CREATE TRIGGER payment_ledger_state AFTER INSERT OR UPDATE OR DELETE ON payment_ledger FOR EACH ROW EXECUTE FUNCTION payment_ledger_state();`
const postgresLowerBound = `
      AND b.starts_at > to_char((NEW.starts_at::timestamptz - make_interval(secs => coalesce((SELECT s.longest_s FROM booking_spans s WHERE s.cutter_id = NEW.cutter_id), 0))) AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"')`

async function upPostgres(knex: Knex): Promise<void> {
  await knex.raw(`INSERT INTO booking_spans (cutter_id, longest_s) SELECT cutter_id, max(${spanSecondsPg('bookings')}) FROM bookings GROUP BY cutter_id`)
  await knex.raw(postgresOverlapGuard(postgresLowerBound))
  await knex.schema.alterTable('bookings', (t) => {
    t.string('payment_state').notNullable().defaultTo('awaiting')
    t.index(['payment_state', 'starts_at'])
  })
  await knex.raw(`UPDATE bookings SET payment_state = ${paymentStateOf('bookings.id')} WHERE id IN (SELECT booking_id FROM payment_ledger)`)
  await knex.raw(postgresKeepers)
}

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('payment_ledger', (t) => t.index(['created_at']))
  // Reports read every booking of a range and keep the live ones: the index holds what they test and read.
  await knex.schema.alterTable('bookings', (t) => t.index(['starts_at', 'ends_at', 'kind', 'status', 'hold_expires_at', 'member_id', 'cutter_id'], 'bookings_starts_at_index'))
  await knex.schema.alterTable('jobs', (t) => t.index(['cut_finished_at']))
  await knex.schema.alterTable('job_events', (t) => t.index(['to_state', 'created_at']))
  await knex.schema.createTable('booking_spans', (t) => {
    t.integer('cutter_id').primary().references('cutters.id')
    t.integer('longest_s').notNullable()
  })
  if (isPostgres(knex)) return upPostgres(knex)
  await knex.raw(`INSERT INTO booking_spans (cutter_id, longest_s) SELECT cutter_id, max(${spanSeconds('bookings')}) FROM bookings GROUP BY cutter_id`)
  await knex.raw(spanKeeper('INSERT'))
  await knex.raw(spanKeeper('UPDATE'))
  for (const event of ['INSERT', 'UPDATE'] as const) {
    await knex.raw(`DROP TRIGGER IF EXISTS bookings_no_overlap_${event.toLowerCase()}`)
    await knex.raw(overlapGuard(event, true))
  }
  await knex.schema.alterTable('bookings', (t) => {
    t.string('payment_state').notNullable().defaultTo('awaiting')
    t.index(['payment_state', 'starts_at'])
  })
  await knex.raw(`UPDATE bookings SET payment_state = ${paymentStateOf('bookings.id')} WHERE id IN (SELECT booking_id FROM payment_ledger)`)
  for (const event of ['INSERT', 'UPDATE', 'DELETE'] as const) await knex.raw(stateKeeper(event))
}

export async function down(knex: Knex): Promise<void> {
  if (isPostgres(knex)) {
    await knex.raw('DROP TRIGGER IF EXISTS payment_ledger_state ON payment_ledger; DROP FUNCTION IF EXISTS payment_ledger_state()')
    await knex.raw('DROP TRIGGER IF EXISTS bookings_span ON bookings; DROP FUNCTION IF EXISTS bookings_span()')
    await knex.schema.alterTable('bookings', (t) => t.dropColumn('payment_state'))
    await knex.raw(postgresOverlapGuard(''))
    await knex.schema.dropTable('booking_spans')
    for (const index of ['job_events_to_state_created_at_index', 'jobs_cut_finished_at_index', 'bookings_starts_at_index', 'payment_ledger_created_at_index']) await knex.raw(`DROP INDEX IF EXISTS ${index}`)
    return
  }
  for (const event of ['INSERT', 'UPDATE', 'DELETE'] as const) await knex.raw(`DROP TRIGGER IF EXISTS payment_ledger_state_${event.toLowerCase()}`)
  await knex.raw('DROP INDEX IF EXISTS bookings_payment_state_starts_at_index')
  // Dropping a column rebuilds the table without its triggers; the overlap guard is written again below.
  await knex.schema.alterTable('bookings', (t) => t.dropColumn('payment_state'))
  for (const event of ['INSERT', 'UPDATE'] as const) {
    await knex.raw(`DROP TRIGGER IF EXISTS bookings_span_${event.toLowerCase()}`)
    await knex.raw(`DROP TRIGGER IF EXISTS bookings_no_overlap_${event.toLowerCase()}`)
    await knex.raw(overlapGuard(event, false))
  }
  await knex.schema.dropTable('booking_spans')
  for (const index of ['job_events_to_state_created_at_index', 'jobs_cut_finished_at_index', 'bookings_starts_at_index', 'payment_ledger_created_at_index']) await knex.raw(`DROP INDEX IF EXISTS ${index}`)
}
