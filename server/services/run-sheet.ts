import type { Knex } from 'knex'
import { cautionsFor, type Caution } from '#shared/safety'
import { gunzipSync } from 'node:zlib'
import { CLOSED_BIT, decodeGeometry, PREVIEW_OPERATIONS } from '#shared/packed-analysis'
import { NotFound } from '../utils/errors'
import { balancesOwed } from './balance'
import { liveBookings } from './bookings'
import { listColours } from './catalog/colours'
import { getCutter } from './catalog/cutters'
import { acknowledgedGroups, type WarningGroupView } from './finding-acknowledgements'
import { currentFindingGroups, filesOfJobs } from './job-revisions'
import { currentFiles, estimateLookups, jobEstimate, type JobRow } from './jobs'
import { timerMinutes, type TimerKind } from './operations'
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
  warningGroups: WarningGroupView[]
  cautions: Caution[]
  timer: { minutes: number; running: boolean }
  actualMinutes: number | null
  pickupLocation: string | null
  problems: { kind: string; note: string; at: string }[]
}

/** The day's booked jobs on one cutter, in order, with everything the operator needs at the machine. */
export async function runSheet(db: Knex, cutterId: number, localDate: string): Promise<{ cutterName: string; date: string; timeZone: string; entries: RunSheetEntry[] }> {
  const settings = await workshopSettings(db)
  const cutter = await getCutter(db, cutterId)
  const day = inZone(`${localDate}T12:00:00Z`, settings.timeZone).startOf('day')
  if (!day.isValid) throw new NotFound('No such day.')
  const from = toUtcIso(day)
  const to = toUtcIso(day.plus({ days: 1 }))
  // A fixed number of queries however many jobs the day holds: each kind of record is read for all of them at once.
  const bookings: (JobRow & Record<string, any>)[] = await liveBookings(db('bookings as b').where({ 'b.cutter_id': cutterId, 'b.kind': 'job' }).where('b.starts_at', '>=', from).where('b.starts_at', '<', to))
    .join('jobs as j', 'j.id', 'b.job_id')
    .join('users as u', 'u.id', 'j.member_id')
    // Handed over: nothing left to do at the machine or the shelf.
    .whereNot('j.state', 'collected')
    .orderBy('b.starts_at')
    .select('b.id as booking_id', 'b.starts_at', 'b.ends_at', 'b.status', 'u.name as member_name', 'u.email as member_email', 'j.*')
  const jobIds = bookings.map((b) => b.id as number)
  const lookups = estimateLookups(db)
  const [filesByJob, timerEvents, problems, balances] = await Promise.all([
    filesOfJobs(db, jobIds),
    db('cut_timer_events').whereIn('job_id', jobIds).orderBy('id').select('job_id', 'kind', 'at') as Promise<{ job_id: number; kind: TimerKind; at: string }[]>,
    db('cut_problems').whereIn('job_id', jobIds).orderBy('id').select('job_id', 'kind', 'note', 'created_at as at') as Promise<{ job_id: number; kind: string; note: string; at: string }[]>,
    balancesOwed(db, { bookingIds: bookings.map((b) => b.booking_id as number) }),
  ])
  const withWarnings = [...filesByJob.values()].flat().filter((f) => f.current.counts.warningGroups > 0)
  const accepted = withWarnings.length ? (await acknowledgedGroups(db, await currentFindingGroups(db, withWarnings))).filter((g) => g.acknowledgement) : []
  const entries: RunSheetEntry[] = []
  for (const row of bookings) {
    const job = row
    const files = filesByJob.get(job.id)!
    const material = await lookups.material(job.material_id)
    const estimate = await jobEstimate(db, job, files, lookups)
    const fileIds = new Set(files.map((f) => f.id))
    const sheet = material.sheets.find((s) => s.id === job.sheet_id) ?? material.sheets[0]!
    const balance = balances.find((b) => b.bookingId === row.booking_id)
    entries.push({
      bookingId: row.booking_id,
      start: row.starts_at,
      end: row.ends_at,
      paid: row.status === 'confirmed',
      balanceOwed: balance ?? null,
      job: { id: job.id, title: job.title, state: job.state, notes: job.notes, overrideReason: job.override_reason },
      member: { name: row.member_name, email: row.member_email },
      material: { name: material.name, thicknessMm: material.thicknessMm, hazardNote: material.hazardNote },
      sheets: { count: estimate.sheetCount, widthMm: sheet.widthMm, heightMm: sheet.heightMm },
      files: files.map((f) => ({ name: f.name, quantity: f.quantity, revision: f.current.revision })),
      warningGroups: accepted.filter((g) => fileIds.has(g.fileId)),
      cautions: cautionsFor(cutter.kind, material),
      timer: timerMinutes(timerEvents.filter((e) => e.job_id === job.id)),
      actualMinutes: job.actual_minutes ?? null,
      pickupLocation: job.pickup_location ?? null,
      problems: problems.filter((p) => p.job_id === job.id).map(({ kind, note, at }) => ({ kind, note, at })),
    })
  }
  return { cutterName: cutter.name, date: localDate, timeZone: settings.timeZone, entries }
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
