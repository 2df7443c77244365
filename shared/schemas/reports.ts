import { z } from 'zod'
import type { JobState } from '../job-states'
import { dateField } from './fields'

// Reports cover local dates [from, to) in the workshop's time zone; `to` is the first day left out.
export const REPORT_DEFAULT_WEEKS = 8
const MAX_REPORT_DAYS = 731

const dayMs = 86_400_000
const dayNumber = (date: string) => Date.parse(`${date}T00:00:00Z`) / dayMs
const dateOfDayNumber = (day: number) => new Date(day * dayMs).toISOString().slice(0, 10)

/** The last eight weeks up to and including `today` (a local date). */
export function defaultReportRange(today: string): { from: string; to: string } {
  const to = dayNumber(today) + 1
  return { from: dateOfDayNumber(to - REPORT_DEFAULT_WEEKS * 7), to: dateOfDayNumber(to) }
}

export const reportQuerySchema = z
  .object({
    from: dateField('from').optional(),
    to: dateField('to').optional(),
    cutter: z.coerce.number({ error: 'Choose a cutter.' }).int().positive({ error: 'Choose a cutter.' }).optional(),
    format: z.enum(['json', 'csv']).optional(),
  })
  .refine((q) => !q.from || !q.to || q.to > q.from, { error: '"to" must be after "from".', path: ['to'] })
  .refine((q) => !q.from || !q.to || dayNumber(q.to) - dayNumber(q.from) <= MAX_REPORT_DAYS, { error: `Ask for at most ${MAX_REPORT_DAYS} days at a time.`, path: ['to'] })
export type ReportQuery = z.output<typeof reportQuerySchema>

export const REPORT_NAMES = ['utilisation', 'revenue', 'minutes-by-member', 'materials', 'jobs-by-state', 'turnaround', 'estimate-accuracy', 'estimate-points'] as const
export type ReportName = (typeof REPORT_NAMES)[number]

/** Every report answers with the range it covered and one table of rows; some add a summary. */
export interface Report<Row, Summary = undefined> {
  from: string
  to: string
  timeZone: string
  cutterId: number | null
  rows: Row[]
  summary: Summary
}

/** An ISO week in the workshop's zone, clipped to the report's range. */
export interface WeekColumns {
  week: string
  weekStart: string
}

export interface UtilisationRow extends WeekColumns {
  openMinutes: number
  bookedMinutes: number
  cuttingMinutes: number
  bookedPercent: number | null
  cuttingPercent: number | null
}

export interface RevenueRow extends WeekColumns {
  cutterId: number
  cutterName: string
  currency: string
  capturedMinor: number
  feeMinor: number
  chargedMinor: number
  refundedMinor: number
  revenueMinor: number
}

export interface MemberMinutesRow {
  memberId: number
  memberName: string
  bookings: number
  bookedMinutes: number
  finishedJobs: number
  cutMinutes: number
}

export interface MaterialUseRow {
  materialId: number
  materialName: string
  family: string
  thicknessMm: number
  finishedJobs: number
  sheets: number
  jobsWithoutSheetCount: number
}

export interface JobStateRow {
  state: JobState
  label: string
  jobs: number
}

export interface TurnaroundRow {
  jobId: number
  jobTitle: string
  cutterName: string
  submittedAt: string
  reviewedAt: string
  outcome: 'approved' | 'changes_requested' | 'rejected'
  hours: number
}

export interface TurnaroundSummary {
  reviews: number
  waiting: number
  medianHours: number | null
  meanHours: number | null
}

export interface ErrorSummary {
  jobs: number
  medianAbsPercentError: number | null
  p90AbsPercentError: number | null
  medianPercentError: number | null
}

export interface EstimateAccuracyRow extends ErrorSummary {
  cutterId: number
  cutterName: string
  materialId: number
  materialName: string
  estimatedMinutes: number
  actualMinutes: number
}

export interface EstimatePointRow {
  jobId: number
  jobTitle: string
  cutterName: string
  materialName: string
  finishedAt: string
  estimatedMinutes: number
  actualMinutes: number
  percentError: number
}

export type UtilisationReport = Report<UtilisationRow>
export type RevenueReport = Report<RevenueRow>
export type MemberMinutesReport = Report<MemberMinutesRow>
export type MaterialUseReport = Report<MaterialUseRow>
export type JobStateReport = Report<JobStateRow>
export type TurnaroundReport = Report<TurnaroundRow, TurnaroundSummary>
export type EstimateAccuracyReport = Report<EstimateAccuracyRow, ErrorSummary>
export type EstimatePointReport = Report<EstimatePointRow>

/** What each report route answers (as JSON), by report name. */
export interface ReportByName {
  utilisation: UtilisationReport
  revenue: RevenueReport
  'minutes-by-member': MemberMinutesReport
  materials: MaterialUseReport
  'jobs-by-state': JobStateReport
  turnaround: TurnaroundReport
  'estimate-accuracy': EstimateAccuracyReport
  'estimate-points': EstimatePointReport
}
