// The binary forms in which a revision's preview geometry and finding sites travel and are stored:
// flat little-endian typed arrays behind a small header, so the browser views them without parsing.
// The server stores and sends them gzip-compressed; these functions see the plain bytes.
import type { FindingSites } from './finding-groups'

export type PreviewOperation = 'cut' | 'score' | 'engrave'
/** Operation codes in `kind` (bits 0–1); bit 2 is set for a closed contour. */
export const PREVIEW_OPERATIONS: readonly PreviewOperation[] = ['cut', 'score', 'engrave']
export const CLOSED_BIT = 4

/** Contours in mm: contour i has points start[i] … start[i+1] − 1 (a closed one repeats its first point last). */
export interface PreviewGeometry {
  count: number
  pointCount: number
  start: Uint32Array
  kind: Uint8Array
  xy: Float32Array
  /** [minX, minY, maxX, maxY] of every point. */
  bbox: [number, number, number, number]
}

/** What the encoder reads: the engine's PolylineSet has these fields. */
export interface ContourSource {
  count: number
  start: Uint32Array
  operation: Uint8Array
  closed: Uint8Array
  xy: Float64Array | Float32Array
}

const GEOMETRY_MAGIC = 0x3147424b // "KBG1"
const SITES_MAGIC = 0x3153424b // "KBS1"
const GEOMETRY_HEADER_BYTES = 48
const SITES_HEADER_BYTES = 16

const padTo4 = (bytes: number) => (bytes + 3) & ~3

export class PackedFormatError extends Error {
  override name = 'PackedFormatError'
}

export function encodeGeometry(source: ContourSource): Uint8Array {
  const count = source.count
  const pointCount = count > 0 ? source.start[count]! : 0
  const startBytes = 4 * (count + 1)
  const kindBytes = padTo4(count)
  const buffer = new ArrayBuffer(GEOMETRY_HEADER_BYTES + startBytes + kindBytes + 8 * pointCount)
  const start = new Uint32Array(buffer, GEOMETRY_HEADER_BYTES, count + 1)
  const kind = new Uint8Array(buffer, GEOMETRY_HEADER_BYTES + startBytes, count)
  const xy = new Float32Array(buffer, GEOMETRY_HEADER_BYTES + startBytes + kindBytes, 2 * pointCount)
  start.set(source.start.subarray(0, count + 1))
  for (let i = 0; i < count; i++) kind[i] = source.operation[i]! | (source.closed[i] ? CLOSED_BIT : 0)
  let minX = Infinity
  let minY = Infinity
  let maxX = -Infinity
  let maxY = -Infinity
  for (let i = 0; i < 2 * pointCount; i += 2) {
    const x = source.xy[i]!
    const y = source.xy[i + 1]!
    xy[i] = x
    xy[i + 1] = y
    if (x < minX) minX = x
    if (x > maxX) maxX = x
    if (y < minY) minY = y
    if (y > maxY) maxY = y
  }
  const header = new DataView(buffer, 0, GEOMETRY_HEADER_BYTES)
  header.setUint32(0, GEOMETRY_MAGIC, true)
  header.setUint32(4, count, true)
  header.setUint32(8, pointCount, true)
  const box = pointCount > 0 ? [minX, minY, maxX, maxY] : [0, 0, 0, 0]
  box.forEach((value, i) => header.setFloat64(16 + 8 * i, value, true))
  return new Uint8Array(buffer)
}

/** Views the bytes in place when they fill their own aligned buffer, else copies them once (a Node Buffer is often a view into a shared pool). */
function alignedBuffer(bytes: Uint8Array | ArrayBuffer): ArrayBuffer {
  if (bytes instanceof ArrayBuffer) return bytes
  if (bytes.byteOffset === 0 && bytes.buffer instanceof ArrayBuffer && bytes.byteLength === bytes.buffer.byteLength) return bytes.buffer
  return new Uint8Array(bytes).buffer as ArrayBuffer
}

export function decodeGeometry(bytes: Uint8Array | ArrayBuffer): PreviewGeometry {
  const buffer = alignedBuffer(bytes)
  if (buffer.byteLength < GEOMETRY_HEADER_BYTES) throw new PackedFormatError('Preview geometry is truncated.')
  const header = new DataView(buffer, 0, GEOMETRY_HEADER_BYTES)
  if (header.getUint32(0, true) !== GEOMETRY_MAGIC) throw new PackedFormatError('Not preview geometry.')
  const count = header.getUint32(4, true)
  const pointCount = header.getUint32(8, true)
  const startBytes = 4 * (count + 1)
  const kindBytes = padTo4(count)
  if (buffer.byteLength !== GEOMETRY_HEADER_BYTES + startBytes + kindBytes + 8 * pointCount) throw new PackedFormatError('Preview geometry has the wrong length.')
  const bbox = [0, 1, 2, 3].map((i) => header.getFloat64(16 + 8 * i, true)) as PreviewGeometry['bbox']
  return {
    count,
    pointCount,
    start: new Uint32Array(buffer, GEOMETRY_HEADER_BYTES, count + 1),
    kind: new Uint8Array(buffer, GEOMETRY_HEADER_BYTES + startBytes, count),
    xy: new Float32Array(buffer, GEOMETRY_HEADER_BYTES + startBytes + kindBytes, 2 * pointCount),
    bbox,
  }
}

export function encodeSites(sites: FindingSites): Uint8Array {
  const n = sites.count
  const buffer = new ArrayBuffer(SITES_HEADER_BYTES + 20 * n)
  const header = new DataView(buffer, 0, SITES_HEADER_BYTES)
  header.setUint32(0, SITES_MAGIC, true)
  header.setUint32(4, n, true)
  new Float32Array(buffer, SITES_HEADER_BYTES, 2 * n).set(sites.xy.subarray(0, 2 * n))
  new Float32Array(buffer, SITES_HEADER_BYTES + 8 * n, n).set(sites.value.subarray(0, n))
  new Int32Array(buffer, SITES_HEADER_BYTES + 12 * n, n).set(sites.contourA.subarray(0, n))
  new Int32Array(buffer, SITES_HEADER_BYTES + 16 * n, n).set(sites.contourB.subarray(0, n))
  return new Uint8Array(buffer)
}

export function decodeSites(bytes: Uint8Array | ArrayBuffer): FindingSites {
  const buffer = alignedBuffer(bytes)
  if (buffer.byteLength < SITES_HEADER_BYTES) throw new PackedFormatError('Finding sites are truncated.')
  const header = new DataView(buffer, 0, SITES_HEADER_BYTES)
  if (header.getUint32(0, true) !== SITES_MAGIC) throw new PackedFormatError('Not finding sites.')
  const n = header.getUint32(4, true)
  if (buffer.byteLength !== SITES_HEADER_BYTES + 20 * n) throw new PackedFormatError('Finding sites have the wrong length.')
  return {
    count: n,
    xy: new Float32Array(buffer, SITES_HEADER_BYTES, 2 * n),
    value: new Float32Array(buffer, SITES_HEADER_BYTES + 8 * n, n),
    contourA: new Int32Array(buffer, SITES_HEADER_BYTES + 12 * n, n),
    contourB: new Int32Array(buffer, SITES_HEADER_BYTES + 16 * n, n),
  }
}

export function emptySites(): FindingSites {
  return { count: 0, xy: new Float32Array(0), value: new Float32Array(0), contourA: new Int32Array(0), contourB: new Int32Array(0) }
}
