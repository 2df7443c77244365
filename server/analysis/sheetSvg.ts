// One stock sheet of a job drawn as SVG for the cutter, from the stored originals of its parts: the engine's reader
// gives each drawn element (exact path data, its matrix into mm, operation, fill rule), svgpath carries it to its
// place on the sheet. Pure and CPU-bound; the server runs it on a worker thread (server/workers/analysis.worker.ts).
import svgpath from 'svgpath'
import type { CutFileFormat } from './dxf/format'
import { parseDxf } from './dxf/parseDxf'
import { readDxfDocument } from './dxf/readDxf'
import { FindingCollector } from './findings'
import type { Matrix } from './matrix'
import type { AnalysisParams } from './params'
import { parseSvgXml } from './parseXml'
import type { DrawnOperation } from './polylines'
import { type DrawnElement, readSvgDocument } from './readSvg'

/** A part as the sheet SVG draws it: the engine's drawn elements of its stored original, and the box its placement refers to. */
export interface SheetPart {
  bbox: { x: number; y: number; width: number; height: number }
  elements: readonly DrawnElement[]
}

/** What the sheet SVG draws: the sheet's size, its placed copies, and the workshop's colour for each operation. */
export interface SheetDrawing {
  widthMm: number
  heightMm: number
  placements: readonly { fileId: number; x: number; y: number; rotated: boolean }[]
  parts: ReadonlyMap<number, SheetPart>
  colourOf: (operation: DrawnOperation) => string
}

/**
 * The engine's reader alone (parse and read, no flattening): each drawn element keeps its exact path data,
 * curves and arcs as drawn, its matrix into mm at full double precision, its operation and fill rule.
 */
export function drawnElementsOf(text: string, format: CutFileFormat, params: AnalysisParams): DrawnElement[] {
  const findings = new FindingCollector()
  return (format === 'dxf' ? readDxfDocument(parseDxf(text), params, findings) : readSvgDocument(parseSvgXml(text), params, findings)).elements
}

/** Where a placed copy goes on the sheet, as an SVG matrix [a b c d e f] from the part's own mm. */
function placementMatrix(bbox: SheetPart['bbox'], placement: SheetDrawing['placements'][number]): Matrix {
  // Turned a quarter: the part's y runs along the sheet's x, its x back along the sheet's y.
  return placement.rotated
    ? [0, -1, 1, 0, placement.x - bbox.y, placement.y + bbox.x + bbox.width]
    : [1, 0, 0, 1, placement.x - bbox.x, placement.y - bbox.y]
}

/**
 * The sheet as SVG text, 1 user unit = 1 mm. Path data is the drawn element's own, carried through its matrix and
 * the placement by svgpath (arcs stay arcs, numbers are not rounded); an engrave area is a filled path with its fill
 * rule and no stroke, a cut or score line a stroke with no fill.
 */
export function sheetSvgText(drawing: SheetDrawing): string {
  const paths: string[] = []
  for (const placement of drawing.placements) {
    const part = drawing.parts.get(placement.fileId)!
    const place = placementMatrix(part.bbox, placement)
    for (const element of part.elements) {
      const d = svgpath(element.pathData).matrix([...element.matrix]).matrix([...place]).toString()
      const colour = drawing.colourOf(element.operation)
      paths.push(element.filled
        ? `<path d="${d}" fill="${colour}" fill-rule="${element.fillRule}" stroke="none"/>`
        : `<path d="${d}" fill="none" stroke="${colour}" stroke-width="0.1"/>`)
    }
  }
  const { widthMm: w, heightMm: h } = drawing
  return `<?xml version="1.0" encoding="UTF-8"?>\n<svg xmlns="http://www.w3.org/2000/svg" width="${w}mm" height="${h}mm" viewBox="0 0 ${w} ${h}">\n<g>\n${paths.join('\n')}\n</g>\n</svg>\n`
}

/** What the worker is handed to draw one sheet: its size and placements, each placed part's original, the process. */
export interface SheetTask {
  widthMm: number
  heightMm: number
  placements: SheetDrawing['placements']
  originals: { fileId: number; bbox: SheetPart['bbox']; text: string; format: CutFileFormat }[]
  params: AnalysisParams
}

/** The sheet's SVG text from the originals, each read once however many copies of it the sheet holds. */
export function drawSheet(task: SheetTask): string {
  const parts = new Map<number, SheetPart>()
  for (const original of task.originals) {
    parts.set(original.fileId, { bbox: original.bbox, elements: drawnElementsOf(original.text, original.format, task.params) })
  }
  const colourOf = (operation: DrawnOperation) => task.params.colourMapping.find((c) => c.operation === operation)?.hex ?? '#000000'
  return sheetSvgText({ widthMm: task.widthMm, heightMm: task.heightMm, placements: task.placements, parts, colourOf })
}
