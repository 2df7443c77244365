import { describe, expect, it } from 'vitest'
import { CLOSED_BIT, PackedFormatError, decodeGeometry, decodeSites, encodeGeometry, encodeSites } from '../../shared/packed-analysis'

describe('packed preview geometry', () => {
  it('round-trips contours, their kind and the box, and survives a copy into an unaligned buffer', () => {
    const source = {
      count: 3,
      start: new Uint32Array([0, 5, 7, 10]),
      operation: new Uint8Array([0, 1, 2]),
      closed: new Uint8Array([1, 0, 0]),
      xy: new Float64Array([0, 0, 10, 0, 10, 10, 0, 10, 0, 0, -2, 3, 4, 5, 1.25, 1.5, 2.25, 2.5, 3.25, 12.5]),
    }
    const bytes = encodeGeometry(source)
    const shifted = new Uint8Array(bytes.length + 1)
    shifted.set(bytes, 1)
    for (const input of [bytes, shifted.subarray(1)]) {
      const geometry = decodeGeometry(input)
      expect(geometry.count).toBe(3)
      expect(geometry.pointCount).toBe(10)
      expect(Array.from(geometry.start)).toEqual([0, 5, 7, 10])
      expect(Array.from(geometry.kind)).toEqual([0 | CLOSED_BIT, 1, 2])
      expect(Array.from(geometry.xy)).toEqual(Array.from(source.xy))
      expect(geometry.bbox).toEqual([-2, 0, 10, 12.5])
    }
  })

  it('refuses bytes that are not geometry or are cut short', () => {
    const bytes = encodeGeometry({
      count: 1,
      start: new Uint32Array([0, 2]),
      operation: new Uint8Array([0]),
      closed: new Uint8Array([0]),
      xy: new Float64Array([0, 0, 1, 1]),
    })
    expect(() => decodeGeometry(bytes.subarray(0, bytes.length - 4))).toThrow(PackedFormatError)
    expect(() => decodeSites(bytes)).toThrow(PackedFormatError)
  })
})

describe('packed finding sites', () => {
  it('round-trips positions, values (NaN where none) and contours', () => {
    const sites = {
      count: 2,
      xy: new Float32Array([1.5, 2.5, -3, 4]),
      value: new Float32Array([0.75, Number.NaN]),
      contourA: new Int32Array([4, 7]),
      contourB: new Int32Array([9, -1]),
    }
    const decoded = decodeSites(encodeSites(sites))
    expect(decoded.count).toBe(2)
    expect(Array.from(decoded.xy)).toEqual([1.5, 2.5, -3, 4])
    expect(decoded.value[0]).toBe(0.75)
    expect(Number.isNaN(decoded.value[1])).toBe(true)
    expect(Array.from(decoded.contourA)).toEqual([4, 7])
    expect(Array.from(decoded.contourB)).toEqual([9, -1])
  })
})
