import DxfParser, { type IDxf } from 'dxf-parser'
import { AnalysisInputError } from '../errors'
import { detectCutFileFormat } from './format'
import { assertReadableDxf, damaged } from './guard'
import { RAW_GROUP_ENTITY_NAMES, rawGroupHandler } from './rawGroupEntities'

/**
 * Reads ASCII DXF text with dxf-parser after the guard has checked it
 * (binary DXF is not text and never gets here). Throws only
 * AnalysisInputError: 415 for text that is not DXF, 422 for damaged DXF.
 */
export function parseDxf(dxfText: string): IDxf {
  if (typeof dxfText !== 'string' || detectCutFileFormat(dxfText) !== 'dxf') {
    throw new AnalysisInputError('notSvg', 'This file is not a DXF drawing (it does not begin with a DXF section). Export the pattern as ASCII DXF or SVG and upload it again.')
  }
  const lines = dxfText.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/)
  assertReadableDxf(lines)
  const parser = new DxfParser()
  for (const name of RAW_GROUP_ENTITY_NAMES) parser.registerEntityHandler(rawGroupHandler(name) as never)
  let dxf: IDxf | null
  try {
    dxf = parser.parseSync(lines.join('\n'))
  } catch (error) {
    throw damaged(`the reader stopped at "${String((error as Error).message).slice(0, 80)}"`)
  }
  if (!dxf) throw damaged('the reader found nothing in it')
  return dxf
}
