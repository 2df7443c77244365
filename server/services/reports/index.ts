import type { Knex } from 'knex'
import type { Report, ReportName } from '#shared/schemas/reports'
import { toCsv } from '../../utils/csv'
import { estimateAccuracyReport, estimatePointReport } from './estimate-accuracy'
import { jobStateReport } from './job-states'
import { materialUseReport } from './materials'
import { memberMinutesReport } from './member-minutes'
import type { ReportRange } from './range'
import { revenueReport } from './revenue'
import { turnaroundReport } from './turnaround'
import { utilisationReport } from './utilisation'

export { resolveRange } from './range'

interface ReportDefinition<Row extends object> {
  build: (db: Knex, range: ReportRange) => Promise<Report<Row, unknown>>
  /** The CSV's columns, in order; the header names are the JSON rows' keys, so a file reads back as the rows. */
  columns: (keyof Row & string)[]
}

function define<Row extends object>(build: ReportDefinition<Row>['build'], columns: ReportDefinition<Row>['columns']): ReportDefinition<Row> {
  return { build, columns }
}

// Each report keeps its own row type; `satisfies` checks that every report name has one.
export const REPORTS = {
  utilisation: define(utilisationReport, ['week', 'weekStart', 'openMinutes', 'bookedMinutes', 'cuttingMinutes', 'bookedPercent', 'cuttingPercent']),
  revenue: define(revenueReport, ['week', 'weekStart', 'cutterId', 'cutterName', 'currency', 'capturedMinor', 'feeMinor', 'chargedMinor', 'refundedMinor', 'revenueMinor']),
  'minutes-by-member': define(memberMinutesReport, ['memberId', 'memberName', 'bookings', 'bookedMinutes', 'finishedJobs', 'cutMinutes']),
  materials: define(materialUseReport, ['materialId', 'materialName', 'family', 'thicknessMm', 'finishedJobs', 'sheets', 'jobsWithoutSheetCount']),
  'jobs-by-state': define(jobStateReport, ['state', 'label', 'jobs']),
  turnaround: define(turnaroundReport, ['jobId', 'jobTitle', 'cutterName', 'submittedAt', 'reviewedAt', 'outcome', 'hours']),
  'estimate-accuracy': define(estimateAccuracyReport, ['cutterId', 'cutterName', 'materialId', 'materialName', 'jobs', 'estimatedMinutes', 'actualMinutes', 'medianAbsPercentError', 'p90AbsPercentError', 'medianPercentError']),
  'estimate-points': define(estimatePointReport, ['jobId', 'jobTitle', 'cutterName', 'materialName', 'finishedAt', 'estimatedMinutes', 'actualMinutes', 'percentError']),
} satisfies Record<ReportName, unknown>

export function reportCsv(name: ReportName, report: Report<object, unknown>): string {
  const columns: string[] = REPORTS[name].columns
  return toCsv(columns, report.rows.map((row) => columns.map((column) => (row as Record<string, unknown>)[column])))
}
