import { gzipSync } from 'node:zlib'
import type { Knex } from 'knex'
import { DateTime } from 'luxon'
import { syncIdSequences } from '../dialect'
import { encodeGeometry, encodeSites } from '../../shared/packed-analysis'
import { seededRandom } from '../../scripts/lib/seeded-random'

// Invented history for the invented demo workshop: members, jobs in every state, bookings, payments,
// refunds, logged minutes and mail, as if the workshop had run for `days` up to `now`. The same options
// and seed always write the same rows (ids included). Rows are written directly, in batches inside one
// transaction, so years of history take seconds; they follow the shapes the services write.

export interface HistoryOptions {
  /** Jobs to create; about three in four are booked and cut. */
  jobs: number
  /** Days of history before `now`. */
  days: number
  seed?: number
  /** Members to invent; by default one per 50 jobs (at least 8). */
  members?: number
  /** Bookings in all, cancelled ones included; by default five per job, as a busy workshop's abandoned holds and moves add up. */
  bookings?: number
  now?: Date
  /** Give the members already in the database (the demo's named ones) a share of the past too; bookings ahead stay with invented members. */
  withExistingMembers?: boolean
}

export interface HistoryCounts {
  members: number
  jobs: number
  revisions: number
  jobEvents: number
  bookings: number
  ledger: number
  mail: number
}

const FIRST_NAMES = ['Aldous', 'Bria', 'Cassin', 'Delphine', 'Emrys', 'Fenna', 'Gideon', 'Hollis', 'Isolde', 'Jory', 'Kestrel', 'Lowen', 'Maren', 'Nico', 'Orla', 'Pascoe', 'Quilla', 'Rhosyn', 'Silas', 'Tamsin', 'Ulric', 'Veda', 'Wynn', 'Yestin', 'Zelie']
const SURNAMES = ['Ashgrove', 'Brackwater', 'Cindermoor', 'Dunleavy', 'Eskridge', 'Fallowby', 'Greythorn', 'Harrowgate', 'Inchbald', 'Juniper', 'Kettlewell', 'Larkspur', 'Millbank', 'Nettlefold', 'Oakhurst', 'Pellow', 'Quarrendon', 'Rookby', 'Saltmarsh', 'Thistlewood']
const THINGS = ['coaster set', 'lamp shade', 'gear blank', 'sign board', 'bracket', 'box joint tray', 'name plate', 'jig plate', 'stencil', 'enclosure panel', 'garden marker', 'clock face', 'cable guide', 'gasket', 'shelf bracket', 'puzzle', 'model rib', 'bird box', 'mounting plate', 'fan guard']
const PROBLEM_NOTES = ['Sheet warped at one corner; re-cut two parts.', 'Lens needed a clean half way through.', 'Parts dropped through the bed; added tabs next time.']

const HOUR = 3_600_000
const DAY = 24 * HOUR
const iso = (ms: number) => new Date(ms).toISOString()

interface Slot {
  cutter: number
  start: number
  end: number
}

/** A job row as the seed builds it: its id and creation time, and columns added as its story unfolds. */
type SeedJob = Record<string, unknown> & { id: number; created_at: string }

/** Batched inserts: up to 500 rows a statement (SQLite compounds at most 500 selects, which Knex writes a multi-row insert as). */
async function insertAll(trx: Knex.Transaction, table: string, rows: Record<string, unknown>[]): Promise<void> {
  if (!rows.length) return
  const perRow = Object.keys(rows[0]!).length
  const size = Math.max(1, Math.min(500, Math.floor(30_000 / perRow)))
  for (let i = 0; i < rows.length; i += size) await trx(table).insert(rows.slice(i, i + size))
}

async function nextId(trx: Knex.Transaction, table: string): Promise<number> {
  const row = await trx(table).max({ id: 'id' }).first()
  return Number(row?.id ?? 0) + 1
}

/** Writes the history into a database that holds the demo workshop (users, catalog, settings). */
export async function seedHistory(knex: Knex, options: HistoryOptions): Promise<HistoryCounts> {
  const random = seededRandom(options.seed ?? 20_261_204)
  const pick = <T>(items: readonly T[]): T => items[Math.floor(random() * items.length)]!
  const between = (low: number, high: number) => low + random() * (high - low)
  const chance = (p: number) => random() < p
  const now = (options.now ?? new Date()).getTime()
  const historyStart = now - options.days * DAY
  const memberCount = options.members ?? Math.max(8, Math.round(options.jobs / 50))
  const bookingTarget = options.bookings ?? options.jobs * 5

  return knex.transaction(async (trx) => {
    const zone = JSON.parse((await trx('settings').where({ key: 'timeZone' }).first('value_json'))?.value_json ?? '"UTC"') as string
    const staff = await trx('users').whereIn('role', ['staff', 'admin']).orderBy('id').select('id', 'email')
    const staffId = staff[0]!.id as number
    const passwordHash = (await trx('users').orderBy('id').first('password_hash')).password_hash as string
    const cutters = await trx('cutters').orderBy('id').select('id', 'price_per_minute_minor as rate', 'setup_minutes as setup', 'billing_increment_minutes as increment', 'booking_granularity_minutes as grid', 'currency')
    const settingsRows = await trx('process_settings as p').join('material_sheets as s', 's.material_id', 'p.material_id').select('p.cutter_id', 'p.material_id', 'p.cut_speed_mm_per_min as speed', 's.id as sheet_id', 's.width_mm', 's.height_mm', 's.price_minor')
    const hours = await trx('opening_hours').select('cutter_id', 'weekday', 'opens_at', 'closes_at')
    const choicesOf = (cutterId: number) => settingsRows.filter((s) => s.cutter_id === cutterId)

    // Members, each signed off on every cutter.
    let userId = await nextId(trx, 'users')
    const members: { id: number; email: string; name: string }[] = []
    const users: Record<string, unknown>[] = []
    // Numbered on from the invented members already there (the demo's own half year), so a second history adds to it.
    const earlier = Number((await trx('users').where('email', 'like', '%@history.example.test').count({ n: '*' }).first())?.n ?? 0)
    for (let i = 0; i < memberCount; i++) {
      const name = `${FIRST_NAMES[i % FIRST_NAMES.length]} ${SURNAMES[Math.floor(i / FIRST_NAMES.length) % SURNAMES.length]}`
      const email = `member-${String(earlier + i + 1).padStart(4, '0')}@history.example.test`
      const joined = iso(historyStart - between(1, 60) * DAY)
      members.push({ id: userId, email, name })
      users.push({ id: userId++, email, name, password_hash: passwordHash, role: 'member', email_verified_at: joined, created_at: joined, updated_at: joined })
    }
    await insertAll(trx, 'users', users)
    const invented = [...members]
    if (options.withExistingMembers) members.push(...(await trx('users').where({ role: 'member' }).whereNotIn('id', invented.map((m) => m.id)).select('id', 'email', 'name')))
    await insertAll(trx, 'sign_offs', members.flatMap((m) => cutters.map((c) => ({ user_id: m.id, cutter_id: c.id, signed_off_on: DateTime.fromMillis(historyStart, { zone }).toISODate(), signed_off_by: staffId, note: 'Induction', created_at: iso(historyStart), updated_at: iso(historyStart) }))))

    // Every opening period of the history (and two weeks ahead) tiled with slots on each cutter's grid.
    const candidates: Slot[] = []
    for (let day = DateTime.fromMillis(historyStart, { zone }).startOf('day'); day.toMillis() < now + 14 * DAY; day = day.plus({ days: 1 })) {
      for (const period of hours.filter((h) => h.weekday === day.weekday)) {
        const cutter = cutters.findIndex((c) => c.id === period.cutter_id)
        const grid = cutters[cutter]!.grid as number
        const [oh, om] = String(period.opens_at).split(':').map(Number)
        const [ch, cm] = String(period.closes_at).split(':').map(Number)
        let start = day.set({ hour: oh, minute: om }).toMillis()
        const end = day.set({ hour: ch, minute: cm }).toMillis()
        for (;;) {
          const length = grid * (1 + Math.floor(random() * (grid >= 30 ? 2 : 4))) * 60_000
          if (start + length > end) break
          candidates.push({ cutter, start, end: start + length })
          start += length
        }
      }
    }
    // Time already booked (a history seeded before) stays as it is: the slots round it are left out.
    const booked = await trx('bookings').whereNot('status', 'cancelled').where('ends_at', '>', iso(historyStart)).select('cutter_id', 'starts_at', 'ends_at')
    if (booked.length) {
      const clashes = (slot: Slot) =>
        booked.some((b) => b.cutter_id === cutters[slot.cutter]!.id && Date.parse(b.starts_at) < slot.end && Date.parse(b.ends_at) > slot.start)
      candidates.splice(0, candidates.length, ...candidates.filter((slot) => !clashes(slot)))
    }
    // About three jobs in four are booked; the slots they take are drawn from the tiling, the rest stay free.
    const wanted = Math.min(candidates.length, Math.round(options.jobs * 0.75))
    for (let i = 0; i < wanted; i++) {
      const j = i + Math.floor(random() * (candidates.length - i))
      ;[candidates[i], candidates[j]] = [candidates[j]!, candidates[i]!]
    }
    const taken = candidates.slice(0, wanted).sort((a, b) => a.start - b.start)
    const free = candidates.slice(wanted)

    // One small drawing shared by every revision: the preview shows a plate with a hole.
    const geometry = gzipSync(encodeGeometry({
      count: 2,
      start: Uint32Array.from([0, 4, 8]),
      operation: Uint8Array.from([0, 0]),
      closed: Uint8Array.from([1, 1]),
      xy: Float64Array.from([0, 0, 120, 0, 120, 80, 0, 80, 50, 30, 70, 30, 70, 50, 50, 50]),
    }))
    const sites = gzipSync(encodeSites({
      count: 0,
      xy: new Float32Array(0),
      value: new Float32Array(0),
      contourA: new Int32Array(0),
      contourB: new Int32Array(0),
    }))

    let jobId = await nextId(trx, 'jobs')
    let fileId = await nextId(trx, 'job_files')
    let revisionId = await nextId(trx, 'file_revisions')
    let bookingId = await nextId(trx, 'bookings')
    type Row = Record<string, unknown>
    const rows = {
      jobs: [] as Row[],
      files: [] as Row[],
      revisions: [] as Row[],
      payloads: [] as Row[],
      events: [] as Row[],
      bookings: [] as Row[],
      ledger: [] as Row[],
      mail: [] as Row[],
      timer: [] as Row[],
      problems: [] as Row[],
    }
    const event = (job: number, actor: number | null, from: string | null, to: string, at: number, comment = '') => rows.events.push({ job_id: job, actor_id: actor, from_state: from, to_state: to, comment, created_at: iso(at), updated_at: iso(at) })
    const mail = (to: string, subject: string, at: number, paragraphs: string[]) => {
      // A few mails to addresses that bounced stay undelivered, for the staff's outbox page.
      const failed = chance(0.01)
      rows.mail.push({ recipient: to, subject, message_json: JSON.stringify({ to, subject, paragraphs }), status: failed ? 'dead' : 'sent', attempts: failed ? 10 : 1, next_attempt_at: iso(at), last_error: failed ? '550 mailbox unavailable' : null, sent_at: failed ? null : iso(at + 20_000), created_at: iso(at), updated_at: iso(at) })
    }
    const ledger = (booking: Record<string, unknown>, kind: string, amount: number, at: number, note = '') => {
      const key = `${kind}:hist_j${booking.job_id}_${rows.ledger.length}`
      rows.ledger.push({ booking, job_id: booking.job_id, member_id: booking.member_id, kind, amount_minor: amount, currency: booking.currency, stripe_object_id: `pi_hist_${booking.id}`, ledger_key: key, note, created_at: iso(at), updated_at: iso(at) })
    }

    /** A job with its files and revisions; returns its machine figures. */
    const newJob = (member: (typeof members)[number], cutter: number, created: number, machineMinutes: number, changes: boolean) => {
      const c = cutters[cutter]!
      const choice = pick(choicesOf(c.id))
      const id = jobId++
      const job: SeedJob = { id, member_id: member.id, title: `${pick(THINGS)} ${1 + Math.floor(random() * 40)}`, cutter_id: c.id, material_id: choice.material_id, sheet_id: choice.sheet_id, notes: '', state: 'draft', created_at: iso(created), updated_at: iso(created) }
      const cutS = Math.max(30, (machineMinutes - c.setup) * 60)
      const files = chance(0.25) ? 2 : 1
      for (let f = 0; f < files; f++) {
        const fid = fileId++
        rows.files.push({ id: fid, job_id: id, name: `part-${f + 1}.svg`, quantity: 1, created_at: iso(created), updated_at: iso(created) })
        for (let revision = 1; revision <= (changes && f === 0 ? 2 : 1); revision++) {
          const share = cutS / files
          const time = { cutS: share * 0.8, scoreS: 0, engraveS: 0, pierceS: share * 0.1, travelS: share * 0.1, setupS: f === 0 ? c.setup * 60 : 0, totalS: 0 }
          time.totalS = time.cutS + time.pierceS + time.travelS + time.setupS
          const width = between(60, Math.min(600, choice.width_mm))
          const height = between(40, Math.min(400, choice.height_mm))
          const analysis = {
            bbox: { x: 0, y: 0, width, height },
            cut: { lengthMm: (time.cutS / 60) * choice.speed, pierces: 2 + Math.floor(random() * 30), closedContours: 2, openContours: 0 },
            score: { lengthMm: 0 },
            engrave: { areaMm2: 0 },
            travelMm: 0,
            time,
            sheet: { fits: true, rotated: false, copies: 1, fitsBed: true },
            findingGroups: [],
            checks: { narrowBridgeSites: 0, narrowestBridgeMm: null, duplicateCutLengthMm: 0, duplicateCutTimeS: 0 },
          }
          const rid = revisionId++
          const at = iso(created + revision * HOUR)
          rows.revisions.push({ id: rid, job_file_id: fid, revision, sha256: (rid.toString(16) + '0'.repeat(64)).slice(0, 64), original_name: `part-${f + 1}.svg`, size_bytes: 4000 + Math.floor(random() * 60_000), content_type: 'image/svg+xml', analysis_json: JSON.stringify(analysis), worst_severity: null, uploaded_by: member.id, created_at: at, updated_at: at, cut_length_mm: analysis.cut.lengthMm, pierces: analysis.cut.pierces, bbox_width_mm: width, bbox_height_mm: height, time_cut_s: time.cutS, time_pierce_s: time.pierceS, time_travel_s: time.travelS, time_setup_s: time.setupS, time_total_s: time.totalS })
          rows.payloads.push({ file_revision_id: rid, geometry_gz: geometry, sites_gz: sites })
        }
      }
      rows.jobs.push(job)
      event(id, member.id, null, 'draft', created)
      return { job, cutS, choice, c }
    }

    /** Draft → submitted (→ changes asked for → submitted) → a review outcome, spread over [created, by]. */
    const review = (job: SeedJob, member: (typeof members)[number], created: number, by: number, changes: boolean, outcome: string) => {
      const span = by - created
      const submitted = created + span * 0.1
      event(job.id, member.id, 'draft', 'submitted', submitted)
      job.submitted_at = iso(submitted)
      let state = 'submitted'
      if (changes) {
        event(job.id, staffId, 'submitted', 'changes_requested', created + span * 0.25, 'Please add tabs to the small parts.')
        event(job.id, member.id, 'changes_requested', 'submitted', created + span * 0.35)
        job.submitted_at = iso(created + span * 0.35)
      }
      if (outcome !== 'submitted') {
        event(job.id, outcome === 'withdrawn' ? member.id : staffId, state, outcome, created + span * 0.5, outcome === 'rejected' ? 'This material is not stocked for that cutter.' : '')
        state = outcome
      }
      job.state = state
      mail(member.email, `Job "${job.title}": ${outcome === 'submitted' ? 'received' : outcome.replace('_', ' ')}`, created + span * 0.5, [`Your job ${job.title} moved on.`])
    }

    // Booked jobs: one per taken slot, in time order.
    const bookedJobs: { job: SeedJob; booking: Record<string, unknown>; bookedAt: number }[] = []
    // The last cut of all still waits to be put on the shelf, the two before it wait for their members.
    const past = taken.filter((slot) => slot.end <= now - HOUR)
    const lastCut = past.at(-1)
    const waiting = new Set(past.slice(-3, -1))
    for (const slot of taken) {
      const member = pick(slot.start > now ? invented : members)
      const grid = cutters[slot.cutter]!.grid as number
      const machineMinutes = (slot.end - slot.start) / 60_000 - between(0, grid * 0.9)
      // Everything before the cut happened before now, even for a booking ahead.
      const bookBy = Math.min(slot.start, now - HOUR)
      const created = Math.max(historyStart - 10 * DAY, Math.min(slot.start - between(1, 10) * DAY, bookBy - between(2, 72) * HOUR))
      const lead = bookBy - created
      const changes = chance(0.15)
      const { job, cutS, choice, c } = newJob(member, slot.cutter, created, machineMinutes, changes)
      review(job, member, created, created + 0.75 * lead, changes, 'approved')
      const bookedAt = created + 0.8 * lead
      event(job.id, member.id, 'approved', 'booked', bookedAt)
      job.state = 'booked'
      const estimateMinor = (Math.ceil(cutS / 60 / c.increment) * c.increment + c.setup) * c.rate + choice.price_minor
      const authorised = Math.floor((estimateMinor * 120 + 50) / 100)
      const booking: Record<string, unknown> = { id: 0, cutter_id: c.id, job_id: job.id, member_id: member.id, kind: 'job', starts_at: iso(slot.start), ends_at: iso(slot.end), status: 'confirmed', hold_expires_at: null, ical_uid: `hist-j${job.id}@kerfbook`, ical_sequence: 0, created_by: member.id, estimate_minor: estimateMinor, authorised_minor: authorised, currency: c.currency, checkout_session_id: `cs_hist_${job.id}`, payment_intent_id: `pi_hist_${job.id}`, reminder_sent_at: slot.start < now ? iso(slot.start - DAY) : null, created_at: iso(bookedAt), updated_at: iso(bookedAt) }
      bookedJobs.push({ job, booking, bookedAt })
      mail(member.email, 'Booking confirmed', bookedAt, [`${job.title}: your cutter time is booked.`])
      if (slot.end > now - HOUR) continue
      // Cut: the minutes logged at finish scatter round the estimate, a little longer on average.
      const actual = Math.max(1, Math.round((cutS / 60) * (1 + between(-0.15, 0.3)) * 10) / 10)
      const finished = Math.min(slot.end, slot.start + (actual + c.setup) * 60_000)
      const capturedMinutes = Math.ceil(actual / c.increment - 1e-9) * c.increment + c.setup
      const charge = capturedMinutes * c.rate + choice.price_minor
      Object.assign(job, { actual_minutes: actual, estimated_minutes: cutS / 60 + c.setup, estimated_cut_s: cutS * 0.8, estimated_pierce_s: cutS * 0.1, estimated_travel_s: cutS * 0.1, estimated_setup_s: c.setup * 60, sheets_used: 1, cut_finished_at: iso(finished), state: 'cut' })
      event(job.id, staffId, 'booked', 'cutting', slot.start)
      event(job.id, staffId, 'cutting', 'cut', finished, `${actual} min`)
      rows.timer.push({ job_id: job.id, kind: 'start', at: iso(slot.start), actor_id: staffId, created_at: iso(slot.start), updated_at: iso(slot.start) }, { job_id: job.id, kind: 'finish', at: iso(finished), actor_id: staffId, created_at: iso(finished), updated_at: iso(finished) })
      if (chance(0.03)) rows.problems.push({ job_id: job.id, kind: 're-cut', note: pick(PROBLEM_NOTES), actor_id: staffId, created_at: iso(finished), updated_at: iso(finished) })
      ledger(booking, 'authorised', authorised, bookedAt)
      ledger(booking, 'captured', Math.min(charge, authorised), finished)
      if (charge < authorised) ledger(booking, 'released', authorised - charge, finished)
      if (charge > authorised) {
        ledger(booking, 'owed', charge - authorised, finished)
        if (finished < now - 2 * DAY) ledger(booking, 'charged', charge - authorised, finished + between(1, 48) * HOUR)
      }
      if (chance(0.02)) ledger(booking, 'refunded', Math.floor(Math.min(charge, authorised) / 2), finished + 3 * DAY, 'Parts re-cut on the workshop')
      const ready = Math.min(finished + between(0.5, 4) * HOUR, now - 60_000)
      if (slot === lastCut) continue
      Object.assign(job, { ready_at: iso(ready), pickup_location: `Shelf ${1 + Math.floor(random() * 12)}`, pickup_code: String(100_000 + Math.floor(random() * 900_000)), state: 'ready' })
      event(job.id, staffId, 'cut', 'ready', ready)
      mail(member.email, 'Your parts are ready', ready, [`${job.title} waits on ${job.pickup_location}.`])
      const collected = ready + between(2, 120) * HOUR
      if (collected > now || waiting.has(slot)) continue
      Object.assign(job, { collected_at: iso(collected), state: 'collected' })
      event(job.id, staffId, 'ready', 'collected', collected)
    }

    // Jobs never booked: older ones ended as drafts left, withdrawn, turned down; recent ones wait somewhere.
    const unbooked = options.jobs - bookedJobs.length
    for (let i = 0; i < unbooked; i++) {
      const member = pick(members)
      // The last few are recent, so the queues have something waiting however small the history.
      const created = i >= unbooked - Math.max(8, unbooked * 0.02) ? now - between(1, 13 * 24) * HOUR : historyStart + random() * (now - historyStart - HOUR)
      const recent = created > now - 14 * DAY
      const roll = random()
      const changes = chance(0.1)
      const { job } = newJob(member, Math.floor(random() * cutters.length), created, between(10, 60), changes)
      const outcome = recent ? (roll < 0.15 ? 'draft' : roll < 0.55 ? 'submitted' : roll < 0.75 ? 'changes_requested' : 'approved') : roll < 0.35 ? 'draft' : roll < 0.75 ? 'withdrawn' : roll < 0.9 ? 'rejected' : 'cancelled'
      if (outcome === 'draft') continue
      review(job, member, created, recent ? now : created + between(1, 7) * DAY, changes && outcome !== 'changes_requested', outcome === 'cancelled' ? 'approved' : outcome)
      if (outcome === 'cancelled') {
        event(job.id, member.id, 'approved', 'cancelled', created + 8 * DAY)
        job.state = 'cancelled'
      }
    }

    // Bookings of the booked jobs, with abandoned holds and member cancellations before each until the target is met.
    const allBookings: Record<string, unknown>[] = []
    const extras = Math.max(0, bookingTarget - bookedJobs.length)
    for (let i = 0; i < extras && bookedJobs.length; i++) {
      const { job, booking, bookedAt } = pick(bookedJobs)
      const at = bookedAt - between(0.05, 1) * Math.max(HOUR, bookedAt - Date.parse(job.created_at))
      const slot = pick(free)
      const extra: Record<string, unknown> = { ...booking, starts_at: iso(slot.start), ends_at: iso(slot.end), cutter_id: cutters[slot.cutter]!.id, ical_uid: '', status: 'cancelled', reminder_sent_at: null, created_at: iso(at), updated_at: iso(at), cancelled_at: iso(at + 30 * 60_000) }
      if (chance(0.8)) {
        Object.assign(extra, { hold_expires_at: iso(at + 30 * 60_000), cancel_reason: 'Not paid in time', checkout_session_id: `cs_hist_${job.id}_${i}`, payment_intent_id: null })
        allBookings.push(extra)
      } else {
        Object.assign(extra, { cancel_reason: 'Cancelled by the member', checkout_session_id: `cs_hist_${job.id}_${i}`, payment_intent_id: `pi_hist_${job.id}_${i}` })
        allBookings.push(extra)
      }
    }
    for (const { booking } of bookedJobs) allBookings.push(booking)
    // Staff blocks for upkeep, about one a fortnight per cutter, on time no job holds.
    for (const slot of free) if (slot.start < now && chance(Math.min(1, (cutters.length * options.days) / 14 / Math.max(1, free.length)))) allBookings.push({ id: 0, cutter_id: cutters[slot.cutter]!.id, job_id: null, member_id: null, kind: 'block', starts_at: iso(slot.start), ends_at: iso(slot.end), status: 'confirmed', note: 'Lens clean and alignment', ical_uid: '', created_by: staffId, created_at: iso(slot.start - 3 * DAY), updated_at: iso(slot.start - 3 * DAY) })
    // Ids in time order. Rows go in newest first, so the overlap trigger of any schema finds only the few rows already written before each start.
    allBookings.sort((a, b) => String(a.created_at).localeCompare(String(b.created_at)))
    for (const booking of allBookings) {
      booking.id = bookingId++
      if (!booking.ical_uid) booking.ical_uid = `hist-b${booking.id}@kerfbook`
      if (booking.status === 'cancelled' && booking.payment_intent_id) {
        ledger(booking, 'authorised', Number(booking.authorised_minor), Date.parse(String(booking.created_at)) + 60_000)
        ledger(booking, 'released', Number(booking.authorised_minor), Date.parse(String(booking.cancelled_at)))
      }
    }
    // Ledger rows were made before their booking had its id.
    const ledgerRows: Record<string, unknown>[] = rows.ledger.map(({ booking, ...row }) => ({ ...row, booking_id: (booking as Record<string, unknown>).id }))
    const byStartDescending = [...allBookings].sort((a, b) => String(b.starts_at).localeCompare(String(a.starts_at)))
    const bookingColumns = ['id', 'cutter_id', 'job_id', 'member_id', 'kind', 'starts_at', 'ends_at', 'status', 'hold_expires_at', 'note', 'ical_uid', 'ical_sequence', 'created_by', 'cancelled_at', 'cancel_reason', 'reminder_sent_at', 'estimate_minor', 'authorised_minor', 'currency', 'checkout_session_id', 'payment_intent_id', 'created_at', 'updated_at']
    const fullRow = (b: Record<string, unknown>) => Object.fromEntries(bookingColumns.map((k) => [k, b[k] ?? (k === 'note' ? '' : k === 'ical_sequence' ? 0 : null)]))

    await insertAll(trx, 'jobs', rows.jobs.map((job) => ({ actual_minutes: null, estimated_minutes: null, estimated_cut_s: null, estimated_pierce_s: null, estimated_travel_s: null, estimated_setup_s: null, sheets_used: null, cut_finished_at: null, ready_at: null, pickup_location: null, pickup_code: null, collected_at: null, submitted_at: null, ...job })))
    await insertAll(trx, 'job_files', rows.files)
    await insertAll(trx, 'file_revisions', rows.revisions)
    await insertAll(trx, 'revision_payloads', rows.payloads)
    await insertAll(trx, 'job_events', rows.events.sort((a, b) => String(a.created_at).localeCompare(String(b.created_at))))
    await insertAll(trx, 'bookings', byStartDescending.map(fullRow))
    await insertAll(trx, 'payment_ledger', ledgerRows.sort((a, b) => String(a.created_at).localeCompare(String(b.created_at))))
    await insertAll(trx, 'cut_timer_events', rows.timer)
    await insertAll(trx, 'cut_problems', rows.problems)
    await insertAll(trx, 'mail_outbox', rows.mail.sort((a, b) => String(a.created_at).localeCompare(String(b.created_at))))
    // The rows above carry their ids; PostgreSQL's sequences must move past them.
    await syncIdSequences(trx)
    return {
      members: members.length,
      jobs: rows.jobs.length,
      revisions: rows.revisions.length,
      jobEvents: rows.events.length,
      bookings: allBookings.length,
      ledger: rows.ledger.length,
      mail: rows.mail.length,
    }
  })
}
