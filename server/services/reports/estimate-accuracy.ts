import type { Knex } from 'knex'
import type { ErrorSummary, EstimateAccuracyReport, EstimatePointReport, EstimatePointRow } from '#shared/schemas/reports'
import { finishedJobs, type FinishedJob } from './activity'
import { reportOf, type ReportRange } from './range'
import { groupBy, mean, median, nearestRankPercentile, rounded } from './statistics'

interface Point extends EstimatePointRow {
  cutterId: number
  materialId: number
}

/**
 * Finished jobs in the range whose estimate was recorded at finish. The estimate compared is the machine
 * time without the one setup, since the minutes logged at finish are billed with the setup added on top.
 * The signed percentage error
 * (estimated − actual) / actual · 100: above zero the estimate was too long, below zero too short.
 */
async function estimatePoints(db: Knex, range: ReportRange): Promise<Point[]> {
  const jobs = (await finishedJobs(db, range)).filter((j) => j.estimated_minutes !== null && j.actual_minutes > 0)
  const estimatedOf = (j: FinishedJob) => j.estimated_minutes! - (j.estimated_setup_s ?? 0) / 60
  const cutters = new Map((await db('cutters').whereIn('id', [...new Set(jobs.map((j) => j.cutter_id))]).select('id', 'name')).map((c) => [c.id as number, c.name as string]))
  const materials = new Map(
    (await db('materials').whereIn('id', [...new Set(jobs.map((j) => j.material_id))]).select('id', 'name', 'thickness_mm')).map((m) => [m.id as number, `${m.name} ${m.thickness_mm} mm`]),
  )
  return jobs.map((j) => ({
    jobId: j.id,
    jobTitle: j.title,
    cutterId: j.cutter_id,
    cutterName: cutters.get(j.cutter_id)!,
    materialId: j.material_id,
    materialName: materials.get(j.material_id)!,
    finishedAt: j.finished_at,
    estimatedMinutes: rounded(estimatedOf(j), 2)!,
    actualMinutes: j.actual_minutes,
    percentError: rounded(((estimatedOf(j) - j.actual_minutes) / j.actual_minutes) * 100, 2)!,
  }))
}

/** Median and 90th percentile (nearest rank) of the absolute percentage error, and the median signed error (bias). */
function errorSummary(points: Point[]): ErrorSummary {
  const errors = points.map((p) => p.percentError)
  const absolute = errors.map(Math.abs)
  return {
    jobs: points.length,
    medianAbsPercentError: rounded(median(absolute)),
    p90AbsPercentError: rounded(nearestRankPercentile(absolute, 90)),
    medianPercentError: rounded(median(errors)),
  }
}

/** Per cutter × material: mean estimated and actual minutes with the error summary; overall in `summary`. */
export async function estimateAccuracyReport(db: Knex, range: ReportRange): Promise<EstimateAccuracyReport> {
  const points = await estimatePoints(db, range)
  const rows = [...groupBy(points, (p) => `${p.cutterId}|${p.materialId}`).values()].map((group) => ({
    cutterId: group[0]!.cutterId,
    cutterName: group[0]!.cutterName,
    materialId: group[0]!.materialId,
    materialName: group[0]!.materialName,
    estimatedMinutes: rounded(mean(group.map((p) => p.estimatedMinutes)), 2)!,
    actualMinutes: rounded(mean(group.map((p) => p.actualMinutes)), 2)!,
    ...errorSummary(group),
  }))
  rows.sort((a, b) => a.cutterName.localeCompare(b.cutterName) || a.materialName.localeCompare(b.materialName))
  return reportOf(range, rows, errorSummary(points))
}

/** The scatter plot's points: one row per finished job. */
export async function estimatePointReport(db: Knex, range: ReportRange): Promise<EstimatePointReport> {
  const points = await estimatePoints(db, range)
  return reportOf(range, points.map(({ cutterId, materialId, ...row }) => row))
}
