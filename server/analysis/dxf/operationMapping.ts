import type { Rgba } from '../colour'
import { toHex } from '../colour'
import { ColourMapper } from '../colourMapping'
import type { AnalysisParams, Operation } from '../params'

/** DXF entities' operations: the workshop's layer mapping by name first, then its colour mapping (the one SVG strokes use). */
export class DxfOperationMapper {
  private readonly byLayer: Map<string, Operation>
  private readonly colours: ColourMapper

  constructor(params: AnalysisParams) {
    this.byLayer = new Map((params.dxfLayerMapping ?? []).map((rule) => [rule.layer.toUpperCase(), rule.operation]))
    this.colours = new ColourMapper(params.colourMapping)
  }

  /** undefined when neither the layer nor the colour is mapped. */
  operationFor(layer: string, colour: number): Operation | undefined {
    const byLayer = this.byLayer.get(layer.toUpperCase())
    if (byLayer !== undefined) return byLayer
    return this.colours.operationFor(rgbaOf(colour), colourHex(colour))
  }
}

function rgbaOf(colour: number): Rgba {
  return { r: (colour >> 16) & 0xff, g: (colour >> 8) & 0xff, b: colour & 0xff, a: 1 }
}

export function colourHex(colour: number): string {
  return toHex(rgbaOf(colour))
}
