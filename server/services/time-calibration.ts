import type { Knex } from 'knex'
import { chooseCalibrationGroup, correctionFor, type CalibrationScope, type CutterTimeSample, type TimeCorrection } from './calibration/index'

export type JobTimeCorrection = TimeCorrection & { scope: CalibrationScope }

/**
 * The time model's correction for a cutter (and material family, when that group alone has enough
 * finished jobs), learnt from the actual minutes staff logged; null until enough jobs exist.
 */
export async function timeCorrectionFor(db: Knex, cutterId: number, materialFamily: string): Promise<JobTimeCorrection | null> {
  // The fit over years of finished jobs takes a good part of a second; it is redone only when the jobs it learns from change.
  const state = await db('jobs')
    .where({ cutter_id: cutterId })
    .whereNotNull('actual_minutes')
    .first(db.raw('count(*) as n, max(id) as last_id, max(cut_finished_at) as last_finish, sum(actual_minutes) as actual, sum(estimated_cut_s) as cut'))
  const key = JSON.stringify([cutterId, materialFamily, state])
  if (fitted.has(key)) return fitted.get(key)!
  const correction = await fitCorrection(db, cutterId, materialFamily)
  if (fitted.size >= MAX_FITS_KEPT) fitted.delete(fitted.keys().next().value!)
  fitted.set(key, correction)
  return correction
}

const MAX_FITS_KEPT = 256
const fitted = new Map<string, JobTimeCorrection | null>()

async function fitCorrection(db: Knex, cutterId: number, materialFamily: string): Promise<JobTimeCorrection | null> {
  const rows = await db('jobs as j')
    .join('materials as m', 'm.id', 'j.material_id')
    .where('j.cutter_id', cutterId)
    .whereNotNull('j.actual_minutes')
    .whereNotNull('j.estimated_cut_s')
    .whereNotNull('j.cut_finished_at')
    .select('j.estimated_cut_s', 'j.estimated_pierce_s', 'j.estimated_travel_s', 'j.estimated_setup_s', 'j.actual_minutes', 'j.cut_finished_at', 'm.family')
  const samples: CutterTimeSample[] = rows.map((r) => ({
    cutterId,
    materialFamily: r.family,
    cutS: r.estimated_cut_s,
    pierceS: r.estimated_pierce_s ?? 0,
    travelS: r.estimated_travel_s ?? 0,
    setupS: r.estimated_setup_s ?? 0,
    actualS: r.actual_minutes * 60,
    finishedAt: r.cut_finished_at,
  }))
  const group = chooseCalibrationGroup(samples, { cutterId, materialFamily })
  const correction = correctionFor(group.samples)
  return correction && { ...correction, scope: group.scope }
}
