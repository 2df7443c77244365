import { chainPolylines } from './chain'
import { runDesignRuleChecks } from './checks/index'
import { type CutFileFormat, detectCutFileFormat } from './dxf/format'
import { parseDxf } from './dxf/parseDxf'
import { readDxfDocument } from './dxf/readDxf'
import { AnalysisInputError } from './errors'
import { FindingCollector } from './findings'
import { PathFlattener } from './flatten'
import { estimateMachineTime } from './machineTime'
import { measureContours } from './measure'
import type { AnalysisParams } from './params'
import { parseSvgXml } from './parseXml'
import { OPERATION_CODES, PolylineSet } from './polylines'
import { type ReadDrawing, readSvgDocument } from './readSvg'
import type { AnalysisResult } from './result'
import { fitOnSheet } from './sheetFit'
import { type AnalysisStage, type StageTimeListener, stageTimer } from './stageTimer'

export { AnalysisInputError, type AnalysisInputErrorKind } from './errors'
export { DEFAULT_ANALYSIS_PARAMS, withDefaults, type AnalysisParams, type ColourRule, type DxfLayerRule, type Operation } from './params'
export type { AnalysisResult, DesignRuleSummary, FindingGroup, FindingSites, FindingStats, Severity } from './result'
export type { AnalysisStage, StageTimeListener } from './stageTimer'
export { detectCutFileFormat, type CutFileFormat } from './dxf/format'

export interface AnalyzeOptions {
  /** Receives each stage's wall time in ms as it finishes (the benchmark prints them). */
  onStageTimed?: StageTimeListener
}

/** The engine's geometry after chaining, for stages (and checks) that work on segments, and for the preview. */
export interface AnalysedGeometry {
  /** The contours the sites' contour ids index (encode with `encodeGeometry` of shared/packed-analysis.ts). */
  contours: PolylineSet
  /** [minX, minY, maxX, maxY] per contour. */
  bounds: Float64Array
  /** Contour ids in cutting order (−1−i: contour i run backwards). */
  runOrder: Int32Array
}

/**
 * Reads an SVG cut pattern and says what the cutter will do: lengths, pierces,
 * engrave area, travel, machine time and sheet fit (the price is the server's,
 * server/services/money.ts). Synchronous and
 * pure (no I/O); run it in a worker for large files. Throws only
 * AnalysisInputError for files it cannot analyse.
 */
export function analyzeSvg(svgText: string, params: AnalysisParams, options: AnalyzeOptions = {}): AnalysisResult {
  return analyzeSvgWithGeometry(svgText, params, options).result
}

export function analyzeSvgWithGeometry(
  svgText: string,
  params: AnalysisParams,
  options: AnalyzeOptions = {},
): { result: AnalysisResult; geometry: AnalysedGeometry } {
  const lap = stageTimer(options.onStageTimed)
  const findings = new FindingCollector()
  return analyzeDrawing(readSvgText(svgText, params, findings, lap), params, findings, lap)
}

/**
 * Parse and read in a scope of their own: once the drawing is read, the
 * SVG tree (millions of small objects and strings) is garbage, and the collector no
 * longer walks it during the later stages.
 */
function readSvgText(svgText: string, params: AnalysisParams, findings: FindingCollector, lap: (stage: AnalysisStage) => void): ReadDrawing {
  const root = parseSvgXml(svgText)
  lap('parse')
  const drawing = readSvgDocument(root, params, findings)
  lap('read')
  return drawing
}

/** The same analysis of a DXF drawing (README: DXF files), read into the geometry the SVG reader gives. */
export function analyzeDxf(dxfText: string, params: AnalysisParams, options: AnalyzeOptions = {}): AnalysisResult {
  return analyzeDxfWithGeometry(dxfText, params, options).result
}

export function analyzeDxfWithGeometry(
  dxfText: string,
  params: AnalysisParams,
  options: AnalyzeOptions = {},
): { result: AnalysisResult; geometry: AnalysedGeometry } {
  const lap = stageTimer(options.onStageTimed)
  const findings = new FindingCollector()
  const dxf = parseDxf(dxfText)
  lap('parse')
  const drawing = readDxfDocument(dxf, params, findings)
  lap('read')
  return analyzeDrawing(drawing, params, findings, lap)
}

/** SVG or DXF, as `format` says or, without it, as the text's content shows. */
export function analyzeCutFile(text: string, params: AnalysisParams, options: AnalyzeOptions & { format?: CutFileFormat } = {}): AnalysisResult {
  return analyzeCutFileWithGeometry(text, params, options).result
}

/** The same, with the geometry the sites' contour ids index (the analysis worker encodes it for the preview). */
export function analyzeCutFileWithGeometry(
  text: string,
  params: AnalysisParams,
  options: AnalyzeOptions & { format?: CutFileFormat } = {},
): { result: AnalysisResult; geometry: AnalysedGeometry } {
  const format = options.format ?? detectCutFileFormat(text)
  return format === 'dxf' ? analyzeDxfWithGeometry(text, params, options) : analyzeSvgWithGeometry(text, params, options)
}

function analyzeDrawing(
  drawing: ReadDrawing,
  params: AnalysisParams,
  findings: FindingCollector,
  lap: (stage: AnalysisStage) => void,
): { result: AnalysisResult; geometry: AnalysedGeometry } {
  const pieces = new PolylineSet()
  const flattener = new PathFlattener(pieces, params.chordToleranceMm)
  drawing.elements.forEach((element, elementIndex) => {
    flattener.flatten(element.pathData, element.matrix, OPERATION_CODES[element.operation], elementIndex, element.filled)
  })
  lap('flatten')
  const contours = chainPolylines(pieces, params.chainToleranceMm)
  lap('chain')
  if (contours.count === 0) throw emptyDrawingError(findings)
  const bounds = contours.bounds()
  const measurement = measureContours(contours, bounds, drawing.elements)
  lap('measure')
  const checks = runDesignRuleChecks({ contours, bounds }, params, findings)
  lap('checks')
  const machine = estimateMachineTime(contours, bounds, measurement.engrave.areaMm2, params)
  lap('time')
  const { width, height } = measurement.bbox
  const result: AnalysisResult = {
    ...measurement,
    travelMm: machine.travelMm,
    time: machine.time,
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
    ...findings.finish(),
    checks,
  }
  lap('result')
  return { result, geometry: { contours, bounds, runOrder: machine.runOrder } }
}

// What an empty drawing holds instead of lines, each kind with what to do about it, in the order they are told.
const NOT_DRAWN_HINTS: ReadonlyArray<readonly [codes: readonly string[], hint: string]> = [
  [['text-not-outlined', 'raster-image'], 'text or images (convert them to paths)'],
  [['dxf-not-planar'], 'lines tilted out of the drawing plane (flatten the drawing onto the XY plane in your CAD program)'],
  [['dxf-dimension', 'dxf-hatch'], 'dimensions or hatches, which are not cut'],
  [['dxf-entity-not-read'], 'elements Kerfbook does not read (explode them into lines, arcs or polylines)'],
]

/** The refusal of a drawing with nothing to cut, score or engrave, naming what it holds instead when the reader saw something. */
function emptyDrawingError(findings: FindingCollector): AnalysisInputError {
  const held = NOT_DRAWN_HINTS.filter(([codes]) => codes.some((code) => findings.countOf(code) > 0)).map(([, hint]) => hint)
  const hint = held.length > 0 ? ` It contains only ${held.join('; ')}.` : ''
  return new AnalysisInputError('empty', `The drawing has no visible lines or shapes to cut, score or engrave.${hint}`)
}
