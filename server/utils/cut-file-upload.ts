import { getRequestHeader, readFormData, type H3Event } from 'h3'
import { MAX_CUT_FILE_BYTES } from '#shared/schemas/analysis'
import { type CutFileFormat, detectCutFileFormat } from '../analysis/dxf/format'
import { activeContentIn } from './active-content'
import { bodyLimitError } from './body-limit'
import { displayFileName } from './file-name'
import { DomainError, InvalidInput, PayloadTooLarge, UnsupportedMediaType } from './errors'

export interface CutFileUpload {
  filename: string
  /** The file's text, SVG or DXF as `format` says. */
  svgText: string
  /** Decided by the content, not the file name. */
  format: CutFileFormat
  sizeBytes: number
  /** The text fields sent beside the file. */
  fields: Record<string, string>
  /** Fires when the client goes away before its answer: its analysis leaves the queue or stops. */
  closed: AbortSignal
}

const limitText = `${MAX_CUT_FILE_BYTES / 1024 / 1024} MB`

/**
 * Reads one cut file from a multipart upload. The size is checked from Content-Length before the body
 * is read, so an oversized upload is refused without holding it in memory; the content, not the
 * file name, decides whether it is text at all.
 */
export async function readCutFileUpload(event: H3Event): Promise<CutFileUpload> {
  const declaredBytes = Number(getRequestHeader(event, 'content-length'))
  if (!Number.isFinite(declaredBytes) || declaredBytes <= 0) throw new DomainError('Send the file with a Content-Length (a normal browser upload does).', 411)
  if (declaredBytes > MAX_CUT_FILE_BYTES + 64 * 1024) throw new PayloadTooLarge(`The file is larger than the ${limitText} limit. Simplify it or split it into several files.`)
  if (!getRequestHeader(event, 'content-type')?.startsWith('multipart/form-data')) {
    throw new InvalidInput('Send the file as multipart/form-data with a field named "file".')
  }
  // Node's own multipart parser (through the web FormData of h3): h3's readMultipartFormData walks the
  // body byte by byte on the request thread, about half a second for a 7 MB pattern while everyone waits.
  let form: FormData
  try {
    form = await readFormData(event)
  } catch {
    throw bodyLimitError(event) ?? new InvalidInput('The upload is not a readable multipart/form-data body. Send the file as a normal browser upload.')
  }
  const file = form.get('file')
  if (!(file instanceof Blob)) throw new InvalidInput('No file was attached: add it as the field "file".')
  if (file.size > MAX_CUT_FILE_BYTES) throw new PayloadTooLarge(`The file is larger than the ${limitText} limit.`)
  const data = new Uint8Array(await file.arrayBuffer())
  let svgText: string
  try {
    svgText = new TextDecoder('utf-8', { fatal: true }).decode(data)
  } catch {
    throw new UnsupportedMediaType('This file is not an SVG or DXF drawing (it is not text; binary DXF is not read). Export your pattern as SVG or ASCII DXF and upload that.')
  }
  const format = detectCutFileFormat(svgText)
  // A DXF never needs scripts either; it is checked too, as its text may be shown or served later like an SVG's.
  assertNoActiveContent(svgText, format)
  const fields: Record<string, string> = {}
  for (const [name, value] of form) if (typeof value === 'string') fields[name] = value
  return { filename: displayFileName((file as File).name ?? '', `upload.${format}`), svgText, format, sizeBytes: data.length, fields, closed: closedSignal(event) }
}

function closedSignal(event: H3Event): AbortSignal {
  const controller = new AbortController()
  const response = event.node.res
  response.once('close', () => {
    if (!response.writableEnded) controller.abort()
  })
  return controller.signal
}

export function assertNoActiveContent(svgText: string, format: CutFileFormat): void {
  const found = activeContentIn(svgText, format)
  if (found.length > 0) {
    throw new DomainError(`This file contains ${found.join(' and ')}, which a cut file never needs. Export the pattern again as a plain ${format === 'dxf' ? 'DXF' : 'SVG'}.`, 422, { kind: 'activeContent' })
  }
}
