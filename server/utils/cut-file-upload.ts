import { getRequestHeader, readMultipartFormData, type H3Event } from 'h3'
import { MAX_CUT_FILE_BYTES } from '#shared/schemas/analysis'
import { DomainError, InvalidInput, PayloadTooLarge, UnsupportedMediaType } from './errors'

export interface CutFileUpload {
  filename: string
  svgText: string
  sizeBytes: number
  /** The text fields sent beside the file. */
  fields: Record<string, string>
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
  const parts = (await readMultipartFormData(event)) ?? []
  const file = parts.find((p) => p.name === 'file' && p.filename !== undefined)
  if (!file) throw new InvalidInput('No file was attached: add it as the field "file".')
  if (file.data.length > MAX_CUT_FILE_BYTES) throw new PayloadTooLarge(`The file is larger than the ${limitText} limit.`)
  let svgText: string
  try {
    svgText = new TextDecoder('utf-8', { fatal: true }).decode(file.data)
  } catch {
    throw new UnsupportedMediaType('This file is not an SVG drawing (it is not text). Export your pattern as SVG and upload that.')
  }
  assertNoActiveContent(svgText)
  const fields = Object.fromEntries(parts.filter((p) => p.filename === undefined && p.name).map((p) => [p.name!, p.data.toString('utf8')]))
  return { filename: file.filename ?? 'upload.svg', svgText, sizeBytes: file.data.length, fields }
}

// Scripts, event handlers, javascript: links and embedded HTML have no place in a cut file; refusing
// them outright means no upload can ever run code, wherever its content is shown later.
const ACTIVE_CONTENT: [RegExp, string][] = [
  [/<script[\s>/]/i, 'a script'],
  [/<foreignObject[\s>/]/i, 'embedded HTML (foreignObject)'],
  [/\son[a-z]+\s*=/i, 'an event handler (on… attribute)'],
  [/(?:href|src)\s*=\s*["']?\s*(?:javascript|data:text\/html)/i, 'a script link'],
]

export function assertNoActiveContent(svgText: string): void {
  const found = ACTIVE_CONTENT.filter(([pattern]) => pattern.test(svgText)).map(([, what]) => what)
  if (found.length > 0) {
    throw new DomainError(`This file contains ${found.join(' and ')}, which a cut file never needs. Export the pattern again as a plain SVG.`, 422, { kind: 'activeContent' })
  }
}
