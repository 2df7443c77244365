import type { Knex } from 'knex'
import type { JobState } from '#shared/job-states'
import { memberBalancesOwed } from './balance'
import { liveBookings } from './bookings'
import { listClosures } from './catalog/opening-hours'
import { calledOffFor, openOutages, type CalledOffForMember, type OutageView } from './cutter-outages'
import { outagesOverlapping } from './cutter-outage-periods'
import { revenueReport } from './reports/revenue'
import { overlapMinutes, resolveRange } from './reports/range'
import { withoutClosures } from './reports/utilisation'
import { workshopSettings } from './settings'
import { inZone, openingIntervals, toUtcIso, type OpeningPeriod, type UtcInterval } from './workshop-time'

// One overview per role, each read with a fixed number of queries whatever the number of jobs or bookings:
// lists are read whole and grouped here, never fetched row by row.

const OPEN_JOB_STATES: JobState[] = ['draft', 'submitted', 'changes_requested', 'approved', 'booked', 'cutting', 'cut', 'ready']
const LIST_LIMIT = 8

export interface MemberJob {
  id: number
  title: string
  state: JobState
  cutterName: string
  updatedAt: string
  /** The job's live booking, if it has one. */
  booking: { id: number; start: string; end: string; status: 'held' | 'confirmed'; payUrl: string | null } | null
  pickupLocation: string | null
}

export interface MemberHome {
  timeZone: string
  jobs: MemberJob[]
  nextBooking: { bookingId: number; jobId: number; jobTitle: string; cutterName: string; start: string; end: string; status: 'held' | 'confirmed' } | null
  readyToCollect: { jobId: number; title: string; location: string | null }[]
  owed: { bookingId: number; jobTitle: string | null; balanceMinor: number; currency: string }[]
  calledOff: CalledOffForMember[]
}

export async function memberHome(db: Knex, memberId: number, now = new Date().toISOString()): Promise<MemberHome> {
  const settings = await workshopSettings(db)
  const rows = await db('jobs as j')
    .join('cutters as c', 'c.id', 'j.cutter_id')
    .leftJoin(
      liveBookings(db('bookings').where({ kind: 'job' }), now)
        .select('id', 'job_id', 'starts_at', 'ends_at', 'status', 'checkout_url')
        .as('b'),
      'b.job_id',
      'j.id',
    )
    .where('j.member_id', memberId)
    .whereIn('j.state', OPEN_JOB_STATES)
    .orderBy('j.updated_at', 'desc')
    .select('j.id', 'j.title', 'j.state', 'j.updated_at', 'j.pickup_location', 'c.name as cutter_name', 'b.id as booking_id', 'b.starts_at', 'b.ends_at', 'b.status as booking_status', 'b.checkout_url')
  const jobs: MemberJob[] = rows.map((r) => ({
    id: r.id,
    title: r.title,
    state: r.state,
    cutterName: r.cutter_name,
    updatedAt: r.updated_at,
    booking: r.booking_id ? { id: r.booking_id, start: r.starts_at, end: r.ends_at, status: r.booking_status, payUrl: r.booking_status === 'held' ? r.checkout_url : null } : null,
    pickupLocation: r.pickup_location,
  }))
  const next = jobs.filter((j) => j.state === 'booked' && j.booking && j.booking.end > now).sort((a, b) => a.booking!.start.localeCompare(b.booking!.start))[0]
  return {
    timeZone: settings.timeZone,
    jobs,
    nextBooking: next
      ? {
          bookingId: next.booking!.id,
          jobId: next.id,
          jobTitle: next.title,
          cutterName: next.cutterName,
          start: next.booking!.start,
          end: next.booking!.end,
          status: next.booking!.status,
        }
      : null,
    readyToCollect: jobs.filter((j) => j.state === 'ready').map((j) => ({ jobId: j.id, title: j.title, location: j.pickupLocation })),
    owed: await memberBalancesOwed(db, memberId),
    calledOff: await calledOffFor(db, memberId),
  }
}

export interface RunSheetSlot {
  bookingId: number
  start: string
  end: string
  kind: 'job' | 'block'
  title: string
  memberName: string | null
  jobId: number | null
  jobState: JobState | null
  paid: boolean
}

export interface StaffHome {
  timeZone: string
  today: string
  review: { total: number; jobs: { id: number; title: string; memberName: string; cutterName: string; submittedAt: string | null }[] }
  runSheets: { cutterId: number; cutterName: string; slots: RunSheetSlot[] }[]
  pickups: { jobId: number; title: string; memberName: string; location: string | null; readyAt: string | null }[]
  outages: OutageView[]
}

/** The local day around `now` in the workshop's zone, as UTC instants. */
function localDay(now: string, zone: string): UtcInterval & { date: string } {
  const day = inZone(now, zone).startOf('day')
  return { start: toUtcIso(day), end: toUtcIso(day.plus({ days: 1 })), date: day.toISODate()! }
}

export async function staffHome(db: Knex, now = new Date().toISOString()): Promise<StaffHome> {
  const settings = await workshopSettings(db)
  const day = localDay(now, settings.timeZone)
  const submitted = db('jobs as j').where('j.state', 'submitted')
  const counted = (await submitted.clone().count({ total: '*' }).first()) as { total: number }
  const reviewRows = await submitted
    .clone()
    .join('users as u', 'u.id', 'j.member_id')
    .join('cutters as c', 'c.id', 'j.cutter_id')
    .orderBy('j.submitted_at')
    .limit(LIST_LIMIT)
    .select('j.id', 'j.title', 'j.submitted_at', 'u.name as member_name', 'c.name as cutter_name')
  const cutters = await db('cutters').whereNot({ status: 'retired' }).orderBy('name').select('id', 'name')
  const bookings: { id: number; cutter_id: number; kind: 'job' | 'block'; starts_at: string; ends_at: string; status: string; note: string; job_id: number | null; title: string | null; state: JobState | null; member_name: string | null }[] = await liveBookings(db('bookings as b').where('b.starts_at', '<', day.end).where('b.ends_at', '>', day.start), now)
    .leftJoin('jobs as j', 'j.id', 'b.job_id')
    .leftJoin('users as u', 'u.id', 'b.member_id')
    .orderBy('b.starts_at')
    .select('b.id', 'b.cutter_id', 'b.kind', 'b.starts_at', 'b.ends_at', 'b.status', 'b.note', 'j.id as job_id', 'j.title', 'j.state', 'u.name as member_name')
  const pickups = await db('jobs as j')
    .join('users as u', 'u.id', 'j.member_id')
    .where('j.state', 'ready')
    .orderBy('j.ready_at')
    .select('j.id', 'j.title', 'j.pickup_location', 'j.ready_at', 'u.name as member_name')
  return {
    timeZone: settings.timeZone,
    today: day.date,
    review: {
      total: Number(counted.total),
      jobs: reviewRows.map((r) => ({ id: r.id, title: r.title, memberName: r.member_name, cutterName: r.cutter_name, submittedAt: r.submitted_at })),
    },
    runSheets: cutters.map((c) => ({
      cutterId: c.id,
      cutterName: c.name,
      slots: bookings
        .filter((b) => b.cutter_id === c.id)
        .map((b) => ({ bookingId: b.id, start: b.starts_at, end: b.ends_at, kind: b.kind, title: b.kind === 'block' ? b.note : (b.title ?? ''), memberName: b.member_name, jobId: b.job_id, jobState: b.state, paid: b.status === 'confirmed' })),
    })),
    pickups: pickups.map((p) => ({ jobId: p.id, title: p.title, memberName: p.member_name, location: p.pickup_location, readyAt: p.ready_at })),
    outages: await openOutages(db, now),
  }
}

export interface CutterWeek {
  cutterId: number
  cutterName: string
  openMinutes: number
  bookedMinutes: number
  /** Booked minutes as a share of the minutes open (opening hours less closures and out-of-service time). */
  bookedPercent: number | null
}

export interface AdminHome extends StaffHome {
  week: {
    /** Local dates: Monday, the next Monday (exclusive), and the Sunday between. */
    from: string
    to: string
    lastDay: string
    revenue: { currency: string; revenueMinor: number }[]
    utilisation: CutterWeek[]
    total: { openMinutes: number; bookedMinutes: number; bookedPercent: number | null }
  }
}

const percent = (part: number, whole: number) => (whole > 0 ? Math.round((part / whole) * 1000) / 10 : null)

/** The staff's overview plus this week's revenue (ledger, as the revenue report counts it) and utilisation per cutter. */
export async function adminHome(db: Knex, now = new Date().toISOString()): Promise<AdminHome> {
  const staff = await staffHome(db, now)
  const monday = inZone(now, staff.timeZone).startOf('week')
  const range = await resolveRange(db, { from: monday.toISODate()!, to: monday.plus({ weeks: 1 }).toISODate()! })
  const week: UtcInterval = { start: range.fromIso, end: range.toIso }
  const revenue = new Map<string, number>()
  for (const row of (await revenueReport(db, range)).rows) revenue.set(row.currency, (revenue.get(row.currency) ?? 0) + row.revenueMinor)
  const hours = await db('opening_hours').orderBy(['weekday', 'opens_at']).select('cutter_id', 'weekday', 'opens_at', 'closes_at')
  const closures = await listClosures(db, { fromIso: week.start })
  const outages = await outagesOverlapping(db, { fromIso: week.start, toIso: week.end })
  const bookings: { cutter_id: number; starts_at: string; ends_at: string }[] = await liveBookings(db('bookings').where({ kind: 'job' }).where('starts_at', '<', week.end).where('ends_at', '>', week.start), now).select('cutter_id', 'starts_at', 'ends_at')
  const utilisation = staff.runSheets.map(({ cutterId, cutterName }) => {
    const periods: OpeningPeriod[] = hours
      .filter((h) => h.cutter_id === cutterId)
      .map((h) => ({ weekday: h.weekday, opensAt: h.opens_at, closesAt: h.closes_at }))
    const shut = [
      ...closures.filter((c) => c.cutterId === null || c.cutterId === cutterId).map((c) => ({ start: c.startsAt, end: c.endsAt })),
      ...outages.filter((o) => o.cutterId === cutterId),
    ]
    const open = openingIntervals(periods, staff.timeZone, week.start, week.end).flatMap((i) => withoutClosures(i, shut))
    const openMinutes = open.reduce((sum, i) => sum + overlapMinutes(i.start, i.end, week), 0)
    const bookedMinutes = bookings.filter((b) => b.cutter_id === cutterId).reduce((sum, b) => sum + overlapMinutes(b.starts_at, b.ends_at, week), 0)
    return { cutterId, cutterName, openMinutes, bookedMinutes, bookedPercent: percent(bookedMinutes, openMinutes) }
  })
  const openMinutes = utilisation.reduce((sum, c) => sum + c.openMinutes, 0)
  const bookedMinutes = utilisation.reduce((sum, c) => sum + c.bookedMinutes, 0)
  return {
    ...staff,
    week: {
      from: range.from,
      to: range.to,
      lastDay: monday.plus({ days: 6 }).toISODate()!,
      revenue: [...revenue].map(([currency, revenueMinor]) => ({ currency, revenueMinor })),
      utilisation,
      total: { openMinutes, bookedMinutes, bookedPercent: percent(bookedMinutes, openMinutes) },
    },
  }
}
