// A small writer of ASCII DXF for tests: group-code/value pairs, one per line, in the sections Kerfbook reads.
export type Group = [code: number, value: string | number]

export interface DxfLayer {
  name: string
  /** ACI colour number; negative means the layer is off. */
  colour?: number
  frozen?: boolean
}

export interface DxfDocumentParts {
  /** $INSUNITS; omitted when undefined. */
  insUnits?: number
  layers?: DxfLayer[]
  blocks?: Record<string, Group[]>
  entities: Group[]
}

export function dxfDocument({ insUnits, layers = [], blocks = {}, entities }: DxfDocumentParts): string {
  const groups: Group[] = [[0, 'SECTION'], [2, 'HEADER']]
  if (insUnits !== undefined) groups.push([9, '$INSUNITS'], [70, insUnits])
  groups.push([0, 'ENDSEC'], [0, 'SECTION'], [2, 'TABLES'], [0, 'TABLE'], [2, 'LAYER'], [70, layers.length])
  for (const layer of layers) groups.push([0, 'LAYER'], [2, layer.name], [70, layer.frozen ? 1 : 0], [62, layer.colour ?? 7])
  groups.push([0, 'ENDTAB'], [0, 'ENDSEC'], [0, 'SECTION'], [2, 'BLOCKS'])
  for (const [name, blockEntities] of Object.entries(blocks)) groups.push([0, 'BLOCK'], [8, '0'], [2, name], [70, 0], [10, 0], [20, 0], [30, 0], ...blockEntities, [0, 'ENDBLK'])
  groups.push([0, 'ENDSEC'], [0, 'SECTION'], [2, 'ENTITIES'], ...entities, [0, 'ENDSEC'], [0, 'EOF'])
  return `${groups.map(([code, value]) => `${code}\n${value}`).join('\n')}\n`
}

export const line = (x1: number, y1: number, x2: number, y2: number, extra: Group[] = []): Group[] => [[0, 'LINE'], [8, '0'], ...extra, [10, x1], [20, y1], [30, 0], [11, x2], [21, y2], [31, 0]]

export const circle = (cx: number, cy: number, radius: number, extra: Group[] = []): Group[] => [[0, 'CIRCLE'], [8, '0'], ...extra, [10, cx], [20, cy], [30, 0], [40, radius]]

export const arc = (cx: number, cy: number, radius: number, startDeg: number, endDeg: number, extra: Group[] = []): Group[] => [[0, 'ARC'], [8, '0'], ...extra, [10, cx], [20, cy], [30, 0], [40, radius], [50, startDeg], [51, endDeg]]

/** Vertices as [x, y, bulge?]. */
export const lwPolyline = (vertices: Array<[number, number, number?]>, closed: boolean, extra: Group[] = []): Group[] => [
  [0, 'LWPOLYLINE'], [8, '0'], ...extra, [90, vertices.length], [70, closed ? 1 : 0],
  ...vertices.flatMap(([x, y, bulge]): Group[] => [[10, x], [20, y], ...(bulge === undefined ? [] : [[42, bulge] as Group])]),
]

interface InsertOptions { scaleX?: number; scaleY?: number; rotationDeg?: number; layer?: string }

export const insert = (block: string, x: number, y: number, options: InsertOptions = {}): Group[] => [
  [0, 'INSERT'], [8, options.layer ?? '0'], [2, block], [10, x], [20, y], [30, 0], [41, options.scaleX ?? 1], [42, options.scaleY ?? 1], [50, options.rotationDeg ?? 0],
]
