import type { Knex } from 'knex'
import type { UtcInterval } from './workshop-time'

// Reads of out-of-service periods, for the booking rules and the calendar; the changes live in cutter-outages.ts.

export interface OutagePeriod extends UtcInterval {
  id: number
  cutterId: number
  reason: string
  /** When staff expect the cutter back; `end` is this until staff put it back in service. */
  expectedBackAt: string
  /** Set once staff put the cutter back in service; `end` is this then. */
  endedAt: string | null
}

interface OutageRow {
  id: number
  cutter_id: number
  reason: string
  starts_at: string
  expected_back_at: string
  ended_at: string | null
}

export function toOutagePeriod(row: OutageRow): OutagePeriod {
  return {
    id: row.id,
    cutterId: row.cutter_id,
    reason: row.reason,
    start: row.starts_at,
    end: row.ended_at ?? row.expected_back_at,
    expectedBackAt: row.expected_back_at,
    endedAt: row.ended_at,
  }
}

const effectiveEnd = (db: Knex) => db.raw('coalesce(ended_at, expected_back_at)')

/** Out-of-service periods sharing time with [fromIso, toIso), on one cutter or on all, in order of start. */
export async function outagesOverlapping(db: Knex, filter: { cutterId?: number; fromIso: string; toIso: string }): Promise<OutagePeriod[]> {
  // A period ended before it began (put back in service in advance) is empty and overlaps nothing.
  const query = db<OutageRow>('cutter_outages').where('starts_at', '<', filter.toIso).where(effectiveEnd(db), '>', filter.fromIso).whereRaw('coalesce(ended_at, expected_back_at) > starts_at').orderBy('starts_at')
  if (filter.cutterId) query.where({ cutter_id: filter.cutterId })
  return (await query).map(toOutagePeriod)
}

/** How the calendar and a refusal name the period. */
export function outageLabel(outage: Pick<OutagePeriod, 'reason'>): string {
  return `out of service (${outage.reason})`
}
