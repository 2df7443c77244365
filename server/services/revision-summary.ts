import { countGroups, type FindingCounts } from '#shared/finding-groups'
import type { AnalysisResult } from '../analysis/index'

// What lists, queues and estimates read of a revision, written into columns once when it is stored, so
// none of them parses a stored analysis (whose finding groups and geometry are kept apart).

/** The small part of the engine's result that is kept as JSON: everything but the site table. */
export type StoredAnalysis = Omit<AnalysisResult, 'sites'>

export type RevisionTime = AnalysisResult['time']

/** A revision's figures as the summary columns hold them. */
export interface RevisionFigures {
  bbox: { x: number; y: number; width: number; height: number }
  cut: { lengthMm: number; pierces: number }
  score: { lengthMm: number }
  engrave: { areaMm2: number }
  time: RevisionTime
  counts: FindingCounts
}

export interface SummaryColumns {
  cut_length_mm: number
  score_length_mm: number
  pierces: number
  engrave_area_mm2: number
  bbox_x_mm: number
  bbox_y_mm: number
  bbox_width_mm: number
  bbox_height_mm: number
  time_cut_s: number
  time_score_s: number
  time_engrave_s: number
  time_pierce_s: number
  time_travel_s: number
  time_setup_s: number
  time_total_s: number
  error_count: number
  warning_count: number
  note_count: number
  error_groups: number
  warning_groups: number
  note_groups: number
}

export const SUMMARY_COLUMN_NAMES: readonly (keyof SummaryColumns)[] = [
  'cut_length_mm',
  'score_length_mm',
  'pierces',
  'engrave_area_mm2',
  'bbox_x_mm',
  'bbox_y_mm',
  'bbox_width_mm',
  'bbox_height_mm',
  'time_cut_s',
  'time_score_s',
  'time_engrave_s',
  'time_pierce_s',
  'time_travel_s',
  'time_setup_s',
  'time_total_s',
  'error_count',
  'warning_count',
  'note_count',
  'error_groups',
  'warning_groups',
  'note_groups',
]

export function summaryColumns(analysis: Pick<StoredAnalysis, 'bbox' | 'cut' | 'score' | 'engrave' | 'time' | 'findingGroups'>): SummaryColumns {
  const counts = countGroups(analysis.findingGroups)
  const { time } = analysis
  return {
    cut_length_mm: analysis.cut.lengthMm,
    score_length_mm: analysis.score.lengthMm,
    pierces: analysis.cut.pierces,
    engrave_area_mm2: analysis.engrave.areaMm2,
    bbox_x_mm: analysis.bbox.x,
    bbox_y_mm: analysis.bbox.y,
    bbox_width_mm: analysis.bbox.width,
    bbox_height_mm: analysis.bbox.height,
    time_cut_s: time.cutS,
    time_score_s: time.scoreS,
    time_engrave_s: time.engraveS,
    time_pierce_s: time.pierceS,
    time_travel_s: time.travelS,
    time_setup_s: time.setupS,
    time_total_s: time.totalS,
    error_count: counts.errors,
    warning_count: counts.warnings,
    note_count: counts.notes,
    error_groups: counts.errorGroups,
    warning_groups: counts.warningGroups,
    note_groups: counts.noteGroups,
  }
}

export function figuresOf(row: SummaryColumns): RevisionFigures {
  return {
    bbox: { x: row.bbox_x_mm, y: row.bbox_y_mm, width: row.bbox_width_mm, height: row.bbox_height_mm },
    cut: { lengthMm: row.cut_length_mm, pierces: row.pierces },
    score: { lengthMm: row.score_length_mm },
    engrave: { areaMm2: row.engrave_area_mm2 },
    time: {
      cutS: row.time_cut_s,
      scoreS: row.time_score_s,
      engraveS: row.time_engrave_s,
      pierceS: row.time_pierce_s,
      travelS: row.time_travel_s,
      setupS: row.time_setup_s,
      totalS: row.time_total_s,
    },
    counts: {
      errors: row.error_count,
      warnings: row.warning_count,
      notes: row.note_count,
      errorGroups: row.error_groups,
      warningGroups: row.warning_groups,
      noteGroups: row.note_groups,
    },
  }
}
