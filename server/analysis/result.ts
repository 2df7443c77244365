import type { Operation } from './params'

export type Severity = 'error' | 'warning' | 'info'

/** Something the engine noticed, located in mm in the drawing's frame. */
export interface Finding {
  code: string
  severity: Severity
  message: string
  x: number
  y: number
  valueMm?: number
  limitMm?: number
}

/** A contour for the preview: a polyline in mm; closed ones repeat their first point at the end. */
export interface PreviewContour {
  operation: Exclude<Operation, 'ignore'>
  closed: boolean
  points: number[]
}

export interface AnalysisResult {
  bbox: { x: number; y: number; width: number; height: number }
  cut: { lengthMm: number; pierces: number; closedContours: number; openContours: number }
  score: { lengthMm: number }
  engrave: { areaMm2: number }
  travelMm: number
  time: { cutS: number; scoreS: number; engraveS: number; pierceS: number; travelS: number; setupS: number; totalS: number }
  billableMinutes: number
  price: { amount: number; currency: string }
  sheet: { fits: boolean; rotated: boolean; copies: number; fitsBed: boolean }
  findings: Finding[]
  /** Only with `{ includeContours: true }`. */
  contours?: PreviewContour[]
}
