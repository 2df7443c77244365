import type { IDxf, IEntity } from 'dxf-parser'
import { ACI_RGB } from './aciColours'

// DXF colour numbers with a meaning of their own (DXF reference, group 62, from memory).
const BY_BLOCK = 0
const BY_LAYER = 256
// Colour 7 is drawn black or white against the background; an absent layer or a top-level BYBLOCK gets it.
const DEFAULT_COLOUR = ACI_RGB[7]!
const DEFAULT_LAYER = '0'

/** Frozen and off layers are not drawn, so not cut; a frozen layer also hides the blocks inserted on it. */
export interface LayerState {
  frozen: boolean
  off: boolean
  /** 0xRRGGBB */
  colour: number
}

/** The drawing's layer table, looked up case-insensitively as DXF names are. */
export class DxfLayers {
  private readonly byName = new Map<string, LayerState>()

  constructor(tables: IDxf['tables'] | undefined) {
    for (const [name, layer] of Object.entries(tables?.layer?.layers ?? {})) {
      if (!layer) continue
      // dxf-parser gives a negative colour (group 62) as visible: false, and flags 1 or 2 (group 70) as frozen.
      this.byName.set(name.toUpperCase(), { frozen: layer.frozen === true, off: layer.visible === false, colour: aciColour(layer.colorIndex) })
    }
  }

  state(name: string): LayerState {
    return this.byName.get(name.toUpperCase()) ?? { frozen: false, off: false, colour: DEFAULT_COLOUR }
  }
}

/** The layer an entity is drawn on: inside a block, entities on layer 0 take the inserting entity's layer. */
export function effectiveLayer(entity: IEntity, insertLayer: string | undefined): string {
  const layer = entity.layer ?? DEFAULT_LAYER
  return layer === DEFAULT_LAYER && insertLayer !== undefined ? insertLayer : layer
}

/**
 * An entity's colour as 0xRRGGBB: its true colour (group 420) or colour
 * number, BYLAYER (256, or none given) the layer's, BYBLOCK (0) the
 * inserting entity's. dxf-parser already resolves numbers and true colours
 * into `color`; entities it does not read carry only the number.
 */
export function entityColour(entity: IEntity, layerColour: number, byBlockColour: number | undefined): number {
  const index = entity.colorIndex
  if (index === BY_BLOCK) return byBlockColour ?? DEFAULT_COLOUR
  if (typeof entity.color === 'number') return entity.color
  if (index === undefined || index === BY_LAYER) return layerColour
  return aciColour(index)
}

function aciColour(index: number | undefined): number {
  const colour = index === undefined ? undefined : ACI_RGB[Math.abs(index)]
  return colour ?? DEFAULT_COLOUR
}
