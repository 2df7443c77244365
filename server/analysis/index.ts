import { chainPolylines } from './chain'
import { runDesignRuleChecks, sortBySeverity } from './checks/index'
import { type CutFileFormat, detectCutFileFormat } from './dxf/format'
import { parseDxf } from './dxf/parseDxf'
import { readDxfDocument } from './dxf/readDxf'
import { AnalysisInputError } from './errors'
import { flattenPath } from './flatten'
import { estimateMachineTime } from './machineTime'
import { measureContours } from './measure'
import type { AnalysisParams } from './params'
import { parseSvgXml } from './parseXml'
import { OPERATION_BY_CODE, OPERATION_CODES, PolylineSet } from './polylines'
import { billableMinutes, priceMinor } from './pricing'
import { type ReadDrawing, readSvgDocument } from './readSvg'
import type { AnalysisResult, PreviewContour } from './result'
import { fitOnSheet } from './sheetFit'
import { type AnalysisStage, type StageTimeListener, stageTimer } from './stageTimer'

export { AnalysisInputError, type AnalysisInputErrorKind } from './errors'
export { DEFAULT_ANALYSIS_PARAMS, withDefaults, type AnalysisParams, type ColourRule, type DxfLayerRule, type Operation } from './params'
export type { AnalysisResult, Finding, PreviewContour, Severity } from './result'
export type { DesignRuleSummary } from './checks/index'
export type { AnalysisStage, StageTimeListener } from './stageTimer'
export { detectCutFileFormat, type CutFileFormat } from './dxf/format'

export interface AnalyzeOptions {
  /** Adds `contours` (polylines in mm with their operation) for a preview. */
  includeContours?: boolean
  /** Receives each stage's wall time in ms as it finishes (the benchmark prints them). */
  onStageTimed?: StageTimeListener
}

/** The engine's geometry after chaining, for stages (and checks) that work on segments. */
export interface AnalysedGeometry {
  contours: PolylineSet
  /** [minX, minY, maxX, maxY] per contour. */
  bounds: Float64Array
  /** Contour ids in cutting order (−1−i: contour i run backwards). */
  runOrder: Int32Array
}

/**
 * Reads an SVG cut pattern and says what the cutter will do: lengths, pierces,
 * engrave area, travel, machine time, price and sheet fit. Synchronous and
 * pure (no I/O); run it in a worker for large files. Throws only
 * AnalysisInputError for files it cannot analyse.
 */
export function analyzeSvg(svgText: string, params: AnalysisParams, options: AnalyzeOptions = {}): AnalysisResult {
  return analyzeSvgWithGeometry(svgText, params, options).result
}

export function analyzeSvgWithGeometry(svgText: string, params: AnalysisParams, options: AnalyzeOptions = {}): { result: AnalysisResult; geometry: AnalysedGeometry } {
  const lap = stageTimer(options.onStageTimed)
  return analyzeDrawing(readSvgText(svgText, params, lap), params, options, lap)
}

/**
 * Parse and read in a scope of their own: once the drawing is read, the
 * svgson tree (millions of small strings) is garbage, and the collector no
 * longer walks it during the later stages.
 */
function readSvgText(svgText: string, params: AnalysisParams, lap: (stage: AnalysisStage) => void): ReadDrawing {
  const root = parseSvgXml(svgText)
  lap('parse')
  const drawing = readSvgDocument(root, params)
  lap('read')
  return drawing
}

/** The same analysis of a DXF drawing (README: DXF files), read into the geometry the SVG reader gives. */
export function analyzeDxf(dxfText: string, params: AnalysisParams, options: AnalyzeOptions = {}): AnalysisResult {
  return analyzeDxfWithGeometry(dxfText, params, options).result
}

export function analyzeDxfWithGeometry(dxfText: string, params: AnalysisParams, options: AnalyzeOptions = {}): { result: AnalysisResult; geometry: AnalysedGeometry } {
  const lap = stageTimer(options.onStageTimed)
  const dxf = parseDxf(dxfText)
  lap('parse')
  const drawing = readDxfDocument(dxf, params)
  lap('read')
  return analyzeDrawing(drawing, params, options, lap)
}

/** SVG or DXF, as `format` says or, without it, as the text's content shows. */
export function analyzeCutFile(text: string, params: AnalysisParams, options: AnalyzeOptions & { format?: CutFileFormat } = {}): AnalysisResult {
  const format = options.format ?? detectCutFileFormat(text)
  return format === 'dxf' ? analyzeDxf(text, params, options) : analyzeSvg(text, params, options)
}

function analyzeDrawing(drawing: ReadDrawing, params: AnalysisParams, options: AnalyzeOptions, lap: (stage: AnalysisStage) => void): { result: AnalysisResult; geometry: AnalysedGeometry } {
  const pieces = new PolylineSet()
  drawing.elements.forEach((element, elementIndex) => {
    flattenPath(element.pathData, element.matrix, params.chordToleranceMm, pieces, OPERATION_CODES[element.operation], elementIndex, element.filled)
  })
  lap('flatten')
  const contours = chainPolylines(pieces, params.chainToleranceMm)
  lap('chain')
  if (contours.count === 0) throw emptyDrawingError(drawing.findings.length > 0)
  const bounds = contours.bounds()
  const measurement = measureContours(contours, bounds, drawing.elements)
  lap('measure')
  const checks = runDesignRuleChecks({ contours, bounds }, params)
  lap('checks')
  const machine = estimateMachineTime(contours, bounds, measurement.engrave.areaMm2, params)
  lap('time')
  const minutes = billableMinutes(machine.time.totalS, params.billingIncrementMinutes)
  const { width, height } = measurement.bbox
  const result: AnalysisResult = {
    ...measurement,
    travelMm: machine.travelMm,
    time: machine.time,
    billableMinutes: minutes,
    price: { amount: priceMinor(minutes, params.pricePerMinuteMinor, width * height, params.materialPriceMinorPerM2), currency: params.currency },
    sheet: fitOnSheet({
      partWidthMm: width,
      partHeightMm: height,
      sheetWidthMm: params.sheetWidthMm,
      sheetHeightMm: params.sheetHeightMm,
      bedWidthMm: params.bedWidthMm,
      bedHeightMm: params.bedHeightMm,
      marginMm: params.marginMm,
      spacingMm: params.kerfMm + params.partGapMm,
    }),
    findings: sortBySeverity([...drawing.findings, ...checks.findings]),
    checks: checks.summary,
  }
  if (options.includeContours) result.contours = previewContours(contours)
  lap('result')
  return { result, geometry: { contours, bounds, runOrder: machine.runOrder } }
}

function emptyDrawingError(hasFindings: boolean): AnalysisInputError {
  const hint = hasFindings ? ' It contains only text or images; convert them to paths.' : ''
  return new AnalysisInputError('empty', `The drawing has no visible lines or shapes to cut, score or engrave.${hint}`)
}

function previewContours(contours: PolylineSet): PreviewContour[] {
  return Array.from({ length: contours.count }, (_, index) => ({
    operation: OPERATION_BY_CODE[contours.operation[index]],
    closed: contours.closed[index] === 1,
    points: Array.from(contours.xy.subarray(2 * contours.start[index], 2 * contours.start[index + 1]), (value) => Math.round(value * 1000) / 1000),
  }))
}
