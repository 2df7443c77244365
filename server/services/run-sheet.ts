import type { Knex } from 'knex'
import { cautionsFor, type Caution } from '#shared/safety'
import { gunzipSync } from 'node:zlib'
import svgpath from 'svgpath'
import { decodeSites } from '#shared/packed-analysis'
import type { CutFileFormat } from '../analysis/dxf/format'
import { parseDxf } from '../analysis/dxf/parseDxf'
import { readDxfDocument } from '../analysis/dxf/readDxf'
import { FindingCollector } from '../analysis/findings'
import type { Matrix } from '../analysis/matrix'
import type { AnalysisParams } from '../analysis/params'
import { parseSvgXml } from '../analysis/parseXml'
import type { DrawnOperation } from '../analysis/polylines'
import { type DrawnElement, readSvgDocument } from '../analysis/readSvg'
import { NotFound } from '../utils/errors'
import { readUpload } from '../utils/upload-store'
import { analysisParamsFor } from './analysis-profile'
import { balancesOwed } from './balance'
import { type BookingRow, liveBookings } from './bookings'
import { getCutter, listCutters } from './catalog/cutters'
import { acknowledgedGroups, type WarningGroupView } from './finding-acknowledgements'
import { currentFindingGroups, filesOfJobs, type FileFindingGroups } from './job-revisions'
import { currentFiles, estimateLookups, jobEstimate, type JobRow } from './jobs'
import { timerMinutes, type TimerKind } from './operations'
import { paymentStateOf, type LedgerRow } from './payments'
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
  const revisionOf = (g: WarningGroupView) => fileGroups.find((f) => f.fileId === g.fileId && f.revision === g.revision)!.revisionId
  // Every revision's sites in one query, however many jobs and files the groups come from.
  const payloads = groups.length ? await db('revision_payloads').whereIn('file_revision_id', [...new Set(groups.map(revisionOf))]).select('file_revision_id', 'sites_gz') : []
  const sitesByRevision = new Map<number, ReturnType<typeof decodeSites>>(
    payloads.map((p: { file_revision_id: number; sites_gz: Buffer }) => [p.file_revision_id, decodeSites(gunzipSync(p.sites_gz))]),
  )
  const result: RunSheetEntry['warningGroups'] = []
  for (const g of groups) {
    const sites = sitesByRevision.get(revisionOf(g))
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

/** A booking of the day joined with its job (every column) and its member. */
type BookedJobRow = JobRow & Pick<BookingRow, 'status'> & {
  booking_id: number
  starts_at: string
  ends_at: string
  member_name: string
  member_email: string
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
  // A fixed number of queries however many jobs the day holds: each kind of record is read for all of them at once.
  const bookings: BookedJobRow[] = await dayBookings()
    .where({ 'bookings.cutter_id': cutterId })
    .join('jobs as j', 'j.id', 'bookings.job_id')
    .join('users as u', 'u.id', 'j.member_id')
    .orderBy('bookings.starts_at')
    .select('bookings.id as booking_id', 'bookings.starts_at', 'bookings.ends_at', 'bookings.status', 'u.name as member_name', 'u.email as member_email', 'j.*')
  const jobIds = bookings.map((b) => b.id)
  const bookingIds = bookings.map((b) => b.booking_id as number)
  const lookups = estimateLookups(db)
  const [filesByJob, timerEvents, problems, ledger, balances] = await Promise.all([
    filesOfJobs(db, jobIds),
    db('cut_timer_events').whereIn('job_id', jobIds).orderBy('id').select('job_id', 'kind', 'at') as Promise<{ job_id: number; kind: TimerKind; at: string }[]>,
    db('cut_problems').whereIn('job_id', jobIds).orderBy('id').select('job_id', 'kind', 'note', 'created_at as at') as Promise<{ job_id: number; kind: string; note: string; at: string }[]>,
    db<LedgerRow>('payment_ledger').whereIn('booking_id', bookingIds).orderBy('id'),
    balancesOwed(db, { bookingIds }),
  ])
  const withWarnings = [...filesByJob.values()].flat().filter((f) => f.current.counts.warningGroups > 0)
  const fileGroups = withWarnings.length ? await currentFindingGroups(db, withWarnings) : []
  const located = await withLocations(db, fileGroups, fileGroups.length ? (await acknowledgedGroups(db, fileGroups)).filter((g) => g.acknowledgement) : [])
  const entries: RunSheetEntry[] = []
  for (const job of bookings) {
    const files = filesByJob.get(job.id)!
    const material = await lookups.material(job.material_id)
    const estimate = await jobEstimate(db, job, files, lookups)
    const fileIds = new Set(files.map((f) => f.id))
    const sheet = material.sheets.find((s) => s.id === job.sheet_id) ?? material.sheets[0]!
    const payment = paymentStateOf(ledger.filter((r) => r.booking_id === job.booking_id))
    entries.push({
      bookingId: job.booking_id,
      start: job.starts_at,
      end: job.ends_at,
      paid: job.status === 'confirmed',
      balanceOwed: balances.find((b) => b.bookingId === job.booking_id) ?? null,
      job: { id: job.id, title: job.title, state: job.state, notes: job.notes, overrideReason: job.override_reason },
      member: { name: job.member_name, email: job.member_email },
      material: { name: material.name, thicknessMm: material.thicknessMm, hazardNote: material.hazardNote },
      sheets: { count: estimate.sheetCount, widthMm: sheet.widthMm, heightMm: sheet.heightMm },
      files: files.map((f) => ({ name: f.name, quantity: f.quantity, revision: f.current.revision })),
      warningGroups: located.filter((g) => fileIds.has(g.fileId)),
      cautions: cautionsFor(cutter.kind, material),
      timer: timerMinutes(timerEvents.filter((e) => e.job_id === job.id)),
      estimateMinutes: Math.round((estimate.machineS - estimate.components.setupS) / 6) / 10,
      actualMinutes: job.actual_minutes ?? null,
      chargedMinor: payment.capturedMinor > 0 ? payment.capturedMinor - payment.refundedMinor : null,
      currency: estimate.currency,
      pickupLocation: job.pickup_location ?? null,
      problems: problems.filter((p) => p.job_id === job.id).map(({ kind, note, at }) => ({ kind, note, at })),
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

/** A part as the sheet SVG draws it: the engine's drawn elements of its stored original, and the box its placement refers to. */
export interface SheetPart {
  bbox: { x: number; y: number; width: number; height: number }
  elements: readonly DrawnElement[]
}

/** What the sheet SVG draws: the sheet's size, its placed copies, and the workshop's colour for each operation. */
export interface SheetDrawing {
  widthMm: number
  heightMm: number
  placements: readonly { fileId: number; x: number; y: number; rotated: boolean }[]
  parts: ReadonlyMap<number, SheetPart>
  colourOf: (operation: DrawnOperation) => string
}

/**
 * The engine's reader alone (parse and read, no flattening): each drawn element keeps its exact path data,
 * curves and arcs as drawn, its matrix into mm at full double precision, its operation and fill rule.
 */
export function drawnElementsOf(text: string, format: CutFileFormat, params: AnalysisParams): DrawnElement[] {
  const findings = new FindingCollector()
  return (format === 'dxf' ? readDxfDocument(parseDxf(text), params, findings) : readSvgDocument(parseSvgXml(text), params, findings)).elements
}

/** Where a placed copy goes on the sheet, as an SVG matrix [a b c d e f] from the part's own mm. */
function placementMatrix(bbox: SheetPart['bbox'], placement: SheetDrawing['placements'][number]): Matrix {
  // Turned a quarter: the part's y runs along the sheet's x, its x back along the sheet's y.
  return placement.rotated
    ? [0, -1, 1, 0, placement.x - bbox.y, placement.y + bbox.x + bbox.width]
    : [1, 0, 0, 1, placement.x - bbox.x, placement.y - bbox.y]
}

/**
 * The sheet as SVG text, 1 user unit = 1 mm. Path data is the drawn element's own, carried through its matrix and
 * the placement by svgpath (arcs stay arcs, numbers are not rounded); an engrave area is a filled path with its fill
 * rule and no stroke, a cut or score line a stroke with no fill.
 */
export function sheetSvgText(drawing: SheetDrawing): string {
  const paths: string[] = []
  for (const placement of drawing.placements) {
    const part = drawing.parts.get(placement.fileId)!
    const place = placementMatrix(part.bbox, placement)
    for (const element of part.elements) {
      const d = svgpath(element.pathData).matrix([...element.matrix]).matrix([...place]).toString()
      const colour = drawing.colourOf(element.operation)
      paths.push(element.filled
        ? `<path d="${d}" fill="${colour}" fill-rule="${element.fillRule}" stroke="none"/>`
        : `<path d="${d}" fill="none" stroke="${colour}" stroke-width="0.1"/>`)
    }
  }
  const { widthMm: w, heightMm: h } = drawing
  return `<?xml version="1.0" encoding="UTF-8"?>\n<svg xmlns="http://www.w3.org/2000/svg" width="${w}mm" height="${h}mm" viewBox="0 0 ${w} ${h}">\n<g>\n${paths.join('\n')}\n</g>\n</svg>\n`
}

/**
 * One stock sheet of a job as an SVG to load on the cutter: every placed copy's drawn elements, read again from the
 * stored original by the engine's reader with the job's process (never the uploaded markup, never the preview's
 * flattened points), moved or turned to its place, in the workshop's own colour for its operation.
 */
export async function sheetSvg(db: Knex, job: JobRow, sheetIndex: number): Promise<string> {
  const files = await currentFiles(db, job.id)
  const estimate = await jobEstimate(db, job, files)
  const sheet = estimate.layout.sheets[sheetIndex]
  if (!sheet) throw new NotFound('No such sheet in this job.')
  const params = await analysisParamsFor(db, { cutterId: job.cutter_id, materialId: job.material_id, sheetId: job.sheet_id })
  const placed = new Set(sheet.placements.map((p) => p.fileId))
  const originals: { id: number; sha256: string; content_type: string }[] = await db('file_revisions')
    .whereIn('id', files.filter((f) => placed.has(f.id)).map((f) => f.current.id))
    .select('id', 'sha256', 'content_type')
  const parts = new Map<number, SheetPart>()
  for (const file of files.filter((f) => placed.has(f.id))) {
    const original = originals.find((o) => o.id === file.current.id)!
    const format: CutFileFormat = original.content_type === 'image/vnd.dxf' ? 'dxf' : 'svg'
    parts.set(file.id, { bbox: file.current.bbox, elements: drawnElementsOf(readUpload(original.sha256).toString('utf8'), format, params) })
  }
  const colourOf = (operation: DrawnOperation) => params.colourMapping.find((c) => c.operation === operation)?.hex ?? '#000000'
  return sheetSvgText({ widthMm: estimate.layout.sheetWidthMm, heightMm: estimate.layout.sheetHeightMm, placements: sheet.placements, parts, colourOf })
}
