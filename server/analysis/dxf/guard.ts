import { AnalysisInputError } from '../errors'
import { NUMBER_PATTERN, shorten } from '../numbers'

/**
 * Group-code value types as the DXF reference lists them ("Group code value
 * types", from memory): real numbers, and integers of the various widths.
 * Anything else (strings, handles, booleans) is left to the parser.
 */
const REAL_CODE_RANGES: ReadonlyArray<readonly [number, number]> = [[10, 59], [110, 149], [210, 239], [460, 469], [1010, 1059]]
const INTEGER_CODE_RANGES: ReadonlyArray<readonly [number, number]> = [
  [60, 99],
  [160, 179],
  [270, 289],
  [370, 389],
  [400, 409],
  [420, 429],
  [440, 459],
  [1060, 1071],
]
const LARGEST_GROUP_CODE = 1071

const INTEGER_PATTERN = /^[+-]?\d+$/
const GROUP_CODE_PATTERN = /^\d{1,4}$/

const inRanges = (code: number, ranges: ReadonlyArray<readonly [number, number]>) => ranges.some(([low, high]) => code >= low && code <= high)

/**
 * Checks a DXF text before dxf-parser reads it, so that the parser only ever
 * sees input on which it terminates and gives numbers: every group code is an
 * integer, every numeric value a finite number, the file ends with 0/EOF,
 * and the structures whose malformed variants make dxf-parser 1.1.2 loop
 * forever are well formed — a table holds only its own records, a POLYLINE
 * only VERTEX entities up to its SEQEND, and an LWPOLYLINE has at least the
 * vertices its count (group 90) announces. One pass over the lines.
 */
export function assertReadableDxf(lines: readonly string[]): void {
  let lastGroupLine = lines.length - 1
  while (lastGroupLine >= 0 && lines[lastGroupLine]!.trim() === '') lastGroupLine--
  if (lastGroupLine < 1 || lines[lastGroupLine - 1]!.trim() !== '0' || lines[lastGroupLine]!.trim() !== 'EOF') {
    throw damaged('it does not end with the end-of-file marker, so it is probably cut short')
  }
  const structure = new StructureCheck()
  for (let line = 0; line + 1 <= lastGroupLine; line += 2) {
    const codeText = lines[line]!.trim()
    const value = lines[line + 1]!.trim()
    if (!GROUP_CODE_PATTERN.test(codeText) || Number(codeText) > LARGEST_GROUP_CODE) {
      throw damaged(`line ${line + 1} should hold a group code but holds "${shorten(codeText)}"`)
    }
    const code = Number(codeText)
    if (inRanges(code, REAL_CODE_RANGES)) assertFiniteReal(value, line + 2)
    else if (inRanges(code, INTEGER_CODE_RANGES) && !INTEGER_PATTERN.test(value)) {
      throw new AnalysisInputError('badNumber', `Line ${line + 2} of the DXF file should hold a whole number but holds "${shorten(value)}". Save the file again from your CAD program.`)
    }
    structure.next(code, value, line + 1)
  }
}

function assertFiniteReal(value: string, lineNumber: number): void {
  // Reals are read in the number grammar the SVG reader accepts.
  if (!NUMBER_PATTERN.test(value)) {
    throw new AnalysisInputError('badNumber', `Line ${lineNumber} of the DXF file should hold a number but holds "${shorten(value)}". Save the file again from your CAD program.`)
  }
  if (!Number.isFinite(Number(value))) {
    throw new AnalysisInputError('outOfRange', `Line ${lineNumber} of the DXF file holds a number too large to be a drawing's (${shorten(value)}). Check the drawing's scale and units in your CAD program.`)
  }
}

/** Follows tables, POLYLINE sequences and LWPOLYLINE vertex counts group by group. */
class StructureCheck {
  private pendingTableName = false
  private tableName: string | undefined
  private inPolyline = false
  private lwPolyline: { declaredVertices: number; coordinates: number; line: number } | undefined

  next(code: number, value: string, lineNumber: number): void {
    if (this.pendingTableName && code === 2) {
      this.tableName = value
      this.pendingTableName = false
    }
    if (this.lwPolyline) {
      if (code === 90) this.lwPolyline.declaredVertices = Number(value)
      else if (code === 10) this.lwPolyline.coordinates++
    }
    if (code !== 0) return
    this.endLwPolyline()
    if (this.tableName !== undefined) {
      if (value === 'ENDTAB') this.tableName = undefined
      else if (value !== this.tableName) throw damaged(`its ${shorten(this.tableName)} table holds a ${shorten(value)} entry (line ${lineNumber})`)
    }
    if (this.inPolyline) {
      if (value === 'SEQEND') this.inPolyline = false
      else if (value !== 'VERTEX') throw damaged(`a POLYLINE is followed by ${shorten(value)} instead of its vertices and SEQEND (line ${lineNumber})`)
    }
    if (value === 'TABLE') this.pendingTableName = true
    else if (value === 'POLYLINE') this.inPolyline = true
    else if (value === 'LWPOLYLINE') this.lwPolyline = { declaredVertices: 0, coordinates: 0, line: lineNumber }
  }

  private endLwPolyline(): void {
    if (!this.lwPolyline) return
    const { declaredVertices, coordinates, line } = this.lwPolyline
    this.lwPolyline = undefined
    if (declaredVertices > coordinates) throw damaged(`an LWPOLYLINE announces ${declaredVertices} vertices but has ${coordinates} (line ${line})`)
  }
}

export function damaged(reason: string): AnalysisInputError {
  return new AnalysisInputError('malformedXml', `This DXF file is damaged or incomplete: ${reason}. Save it again from your CAD program as ASCII DXF.`)
}
