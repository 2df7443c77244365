import type { Knex } from 'knex'
import { cautionsFor, type Caution } from '#shared/safety'
import { gunzipSync } from 'node:zlib'
import { CLOSED_BIT, decodeGeometry, decodeSites, PREVIEW_OPERATIONS } from '#shared/packed-analysis'
import { NotFound } from '../utils/errors'
import { balancesOwed } from './balance'
import { liveBookings } from './bookings'
import { listColours } from './catalog/colours'
import { getCutter, listCutters } from './catalog/cutters'
import { getMaterial } from './catalog/materials'
import { acknowledgedGroups, type WarningGroupView } from './finding-acknowledgements'
import { currentFindingGroups, type FileFindingGroups } from './job-revisions'
import { currentFiles, jobEstimate, type JobRow } from './jobs'
import { timerMinutes, type TimerKind } from './operations'
import { ledgerFor, paymentStateOf } from './payments'
import { workshopSettings } from './settings'
import { inZone, toUtcIso } from './workshop-time'

export interface RunSheetEntry {
  bookingId: number
  start: string
  end: string
  paid: boolean
  /** Owed beyond the hold after the cut; staff confirm before handing the parts over. */
  balanceOwed: { balanceMinor: number; currency: string } | null
  job: { id: number; title: string; state: string; notes: string; overrideReason: string | null }
  member: { name: string; email: string }
  material: { name: string; thicknessMm: number; hazardNote: string }
  sheets: { count: number; widthMm: number; heightMm: number }
  files: { name: string; quantity: number; revision: number }[]
  /** The groups of warnings the member accepted, with their reasons and where they are. */
  warningGroups: (WarningGroupView & { locations: SiteLocation[] })[]
  cautions: Caution[]
  timer: { minutes: number; running: boolean }
  /** The estimate's cutting minutes (machine time without the setup), to read beside the timer. */
  estimateMinutes: number
  actualMinutes: number | null
  /** What the card paid so far for this booking (captures and balances, less refunds), once anything was charged. */
  chargedMinor: number | null
  currency: string
  pickupLocation: string | null
  problems: { kind: string; note: string; at: string }[]
}

/** Where a finding is, in mm from the drawing's top-left corner. */
export interface SiteLocation {
  x: number
  y: number
}

// Enough places to find them at the machine; the job's preview has every one.
const LOCATIONS_PER_GROUP = 5

/** The first places of each acknowledged group, read from the revision's packed sites (one decode per revision). */
async function withLocations(db: Knex, fileGroups: FileFindingGroups[], groups: WarningGroupView[]): Promise<RunSheetEntry['warningGroups']> {
  const sitesByRevision = new Map<number, ReturnType<typeof decodeSites>>()
  const result: RunSheetEntry['warningGroups'] = []
  for (const g of groups) {
    const revisionId = fileGroups.find((f) => f.fileId === g.fileId && f.revision === g.revision)!.revisionId
    if (!sitesByRevision.has(revisionId)) {
      const payload = await db('revision_payloads').where({ file_revision_id: revisionId }).first('sites_gz')
      if (payload) sitesByRevision.set(revisionId, decodeSites(gunzipSync(payload.sites_gz)))
    }
    const sites = sitesByRevision.get(revisionId)
    const locations: SiteLocation[] = []
    for (let row = g.group.firstSite; sites && row < Math.min(g.group.firstSite + g.group.count, g.group.firstSite + LOCATIONS_PER_GROUP, sites.count); row++) {
      locations.push({ x: sites.xy[2 * row]!, y: sites.xy[2 * row + 1]! })
    }
    result.push({ ...g, locations })
  }
  return result
}

export interface RunSheetDay {
  cutterId: number
  cutterName: string
  date: string
  timeZone: string
  /** Every cutter in service with the number of jobs booked on it that day, for the choice of cutter. */
  cutters: { id: number; name: string; bookings: number }[]
  /** Every job of the day not yet handed over, in order of its booking. */
  entries: RunSheetEntry[]
  /** The day's jobs already handed over to their members. */
  collected: RunSheetEntry[]
}

/**
 * The day's booked jobs on one cutter, in order, with everything the operator needs at the machine.
 * Without a cutter: the preferred one if it has bookings that day, else the one with the most, else the preferred one.
 */
export async function runSheet(db: Knex, choice: { cutterId?: number; preferredCutterId?: number }, localDate: string): Promise<RunSheetDay> {
  const settings = await workshopSettings(db)
  const day = inZone(`${localDate}T12:00:00Z`, settings.timeZone).startOf('day')
  if (!day.isValid) throw new NotFound('No such day.')
  const from = toUtcIso(day)
  const to = toUtcIso(day.plus({ days: 1 }))
  const dayBookings = () => liveBookings(db('bookings').where({ kind: 'job' }).where('starts_at', '>=', from).where('starts_at', '<', to))
  const counts = new Map<number, number>(((await dayBookings().groupBy('cutter_id').select('cutter_id', db.raw('count(*) as n'))) as { cutter_id: number; n: number }[]).map((r) => [r.cutter_id, Number(r.n)]))
  const cutters = (await listCutters(db)).map((c) => ({ id: c.id, name: c.name, bookings: counts.get(c.id) ?? 0 }))
  const busiest = [...cutters].sort((a, b) => b.bookings - a.bookings)[0]
  const preferred = cutters.find((c) => c.id === choice.preferredCutterId)
  const cutterId = choice.cutterId ?? (preferred?.bookings ? preferred.id : busiest?.bookings ? busiest.id : (preferred?.id ?? busiest?.id))
  if (!cutterId) throw new NotFound('No cutter is set up yet.')
  const cutter = await getCutter(db, cutterId)
  const bookings = await dayBookings().where({ cutter_id: cutterId }).orderBy('starts_at')
  const entries: RunSheetEntry[] = []
  for (const booking of bookings) {
    const job = (await db<JobRow & Record<string, any>>('jobs').where({ id: booking.job_id }).first())!
    const [member, material, files, events, problems, ledger] = await Promise.all([
      db('users').where({ id: job.member_id }).first('name', 'email'),
      getMaterial(db, job.material_id),
      currentFiles(db, job.id),
      db('cut_timer_events').where({ job_id: job.id }).orderBy('id').select('kind', 'at') as Promise<{ kind: TimerKind; at: string }[]>,
      db('cut_problems').where({ job_id: job.id }).orderBy('id').select('kind', 'note', 'created_at as at'),
      ledgerFor(db, booking.id),
    ])
    const estimate = await jobEstimate(db, job, files)
    const withWarnings = files.filter((f) => f.current.counts.warningGroups > 0)
    const fileGroups = withWarnings.length ? await currentFindingGroups(db, withWarnings) : []
    const acknowledged = fileGroups.length ? (await acknowledgedGroups(db, fileGroups)).filter((g) => g.acknowledgement) : []
    const sheet = material.sheets.find((s) => s.id === job.sheet_id) ?? material.sheets[0]!
    const payment = paymentStateOf(ledger)
    entries.push({
      bookingId: booking.id,
      start: booking.starts_at,
      end: booking.ends_at,
      paid: booking.status === 'confirmed',
      balanceOwed: (await balancesOwed(db, { bookingId: booking.id }))[0] ?? null,
      job: { id: job.id, title: job.title, state: job.state, notes: job.notes, overrideReason: job.override_reason },
      member,
      material: { name: material.name, thicknessMm: material.thicknessMm, hazardNote: material.hazardNote },
      sheets: { count: estimate.sheetCount, widthMm: sheet.widthMm, heightMm: sheet.heightMm },
      files: files.map((f) => ({ name: f.name, quantity: f.quantity, revision: f.current.revision })),
      warningGroups: await withLocations(db, fileGroups, acknowledged),
      cautions: cautionsFor(cutter.kind, material),
      timer: timerMinutes(events),
      estimateMinutes: Math.round((estimate.machineS - estimate.components.setupS) / 6) / 10,
      actualMinutes: job.actual_minutes ?? null,
      chargedMinor: payment.capturedMinor > 0 ? payment.capturedMinor - payment.refundedMinor : null,
      currency: estimate.currency,
      pickupLocation: job.pickup_location ?? null,
      problems,
    })
  }
  return {
    cutterId: cutter.id,
    cutterName: cutter.name,
    date: localDate,
    timeZone: settings.timeZone,
    cutters,
    entries: entries.filter((e) => e.job.state !== 'collected'),
    collected: entries.filter((e) => e.job.state === 'collected'),
  }
}

/**
 * One stock sheet of a job as an SVG to load on the cutter: every placed copy's checked geometry
 * (the engine's normalised contours, never the uploaded markup), moved or turned to its place, in
 * the workshop's own stroke colour for its operation, 1 user unit = 1 mm.
 */
export async function sheetSvg(db: Knex, job: JobRow, sheetIndex: number): Promise<string> {
  const files = await currentFiles(db, job.id)
  const estimate = await jobEstimate(db, job, files)
  const sheet = estimate.layout.sheets[sheetIndex]
  if (!sheet) throw new NotFound('No such sheet in this job.')
  const geometries = new Map<number, { bbox: (typeof files)[number]['current']['bbox']; geometry: ReturnType<typeof decodeGeometry> }>()
  for (const file of files) {
    const payload = await db('revision_payloads').where({ file_revision_id: file.current.id }).first('geometry_gz')
    geometries.set(file.id, { bbox: file.current.bbox, geometry: decodeGeometry(gunzipSync(payload.geometry_gz)) })
  }
  const colours = await listColours(db)
  const strokeFor = (operation: string) => colours.find((c) => c.operation === operation)?.hex ?? '#000000'
  const paths: string[] = []
  for (const placement of sheet.placements) {
    const { bbox, geometry } = geometries.get(placement.fileId)!
    const { x: bx, y: by, width: bw } = bbox
    // Turned a quarter: the part's y runs along the sheet's x, its x back along the sheet's y.
    const place = (x: number, y: number): [number, number] => (placement.rotated ? [placement.x + (y - by), placement.y + (bx + bw - x)] : [placement.x + (x - bx), placement.y + (y - by)])
    for (let contour = 0; contour < geometry.count; contour++) {
      let d = ''
      for (let point = geometry.start[contour]!; point < geometry.start[contour + 1]!; point++) {
        const [x, y] = place(geometry.xy[2 * point]!, geometry.xy[2 * point + 1]!)
        d += `${d ? 'L' : 'M'}${x.toFixed(3)} ${y.toFixed(3)}`
      }
      const kind = geometry.kind[contour]!
      paths.push(`<path d="${d}${kind & CLOSED_BIT ? 'Z' : ''}" stroke="${strokeFor(PREVIEW_OPERATIONS[kind & 3]!)}"/>`)
    }
  }
  const { sheetWidthMm: w, sheetHeightMm: h } = estimate.layout
  return `<?xml version="1.0" encoding="UTF-8"?>\n<svg xmlns="http://www.w3.org/2000/svg" width="${w}mm" height="${h}mm" viewBox="0 0 ${w} ${h}">\n<g fill="none" stroke-width="0.1">\n${paths.join('\n')}\n</g>\n</svg>\n`
}
