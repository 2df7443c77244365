import type { Knex } from 'knex'
import type { MaterialUseReport } from '#shared/schemas/reports'
import { finishedJobs } from './activity'
import { reportOf, type ReportRange } from './range'

/** Stock sheets used per material by the jobs finished in the range, as recorded when each cut finished. */
export async function materialUseReport(db: Knex, range: ReportRange): Promise<MaterialUseReport> {
  const jobs = await finishedJobs(db, range)
  const materials = await db('materials').whereIn('id', [...new Set(jobs.map((j) => j.material_id))]).select('id', 'name', 'family', 'thickness_mm')
  const rows = materials.map((m: { id: number; name: string; family: string; thickness_mm: number }) => {
    const used = jobs.filter((j) => j.material_id === m.id)
    return {
      materialId: m.id,
      materialName: m.name,
      family: m.family,
      thicknessMm: m.thickness_mm,
      finishedJobs: used.length,
      sheets: used.reduce((sum, j) => sum + (j.sheets_used ?? 0), 0),
      // Jobs finished before sheets were recorded at finish: their sheets are unknown, not zero.
      jobsWithoutSheetCount: used.filter((j) => j.sheets_used === null).length,
    }
  })
  return reportOf(range, rows.sort((a, b) => b.sheets - a.sheets || a.materialName.localeCompare(b.materialName) || a.thicknessMm - b.thicknessMm))
}
