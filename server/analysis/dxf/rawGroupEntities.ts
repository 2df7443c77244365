import type { IEntity, IPoint } from 'dxf-parser'

/** An entity kept as its group-code/value pairs, for entities dxf-parser does not read (or reads without what Kerfbook needs). */
export interface RawGroupEntity extends IEntity {
  groups: Array<[number, string | number | boolean]>
  /** Groups 210/220/230 when present. */
  extrusionDirection?: IPoint
}

/** The part of dxf-parser's scanner that entity handlers use. */
interface GroupScanner {
  next(): { code: number; value: string | number | boolean }
  isEOF(): boolean
}

/**
 * SPLINE (dxf-parser 1.1.2 drops the weights, group 41, of rational splines),
 * CIRCLE and ELLIPSE (it drops their extrusion direction, groups 210/220/230,
 * which places mirrored ones), HATCH and IMAGE (it skips them): registered
 * with the parser's own `registerEntityHandler`, so the parser still walks
 * the file.
 */
export const RAW_GROUP_ENTITY_NAMES = ['SPLINE', 'HATCH', 'IMAGE', 'CIRCLE', 'ELLIPSE'] as const

/** A dxf-parser entity handler that keeps the entity's groups, reading the common ones the way the parser does. */
export function rawGroupHandler(entityName: (typeof RAW_GROUP_ENTITY_NAMES)[number]) {
  return class RawGroupHandler {
    ForEntityName = entityName
    parseEntity(scanner: GroupScanner, first: { value: string | number | boolean }): RawGroupEntity {
      const entity = { type: String(first.value), groups: [] } as unknown as RawGroupEntity
      let group = scanner.next()
      while (!scanner.isEOF() && group.code !== 0) {
        if (group.code === 8) entity.layer = String(group.value)
        else if (group.code === 62) entity.colorIndex = group.value as number
        else if (group.code === 420) entity.color = group.value as number
        else if (group.code === 60) entity.visible = group.value === 0
        else if (group.code === 67) entity.inPaperSpace = group.value !== 0
        else entity.groups.push([group.code, group.value])
        group = scanner.next()
      }
      const extrusion = pointOf(entity.groups, 210)
      if (extrusion) entity.extrusionDirection = { ...extrusion, z: extrusion.z ?? 1 }
      if (entityName === 'CIRCLE') Object.assign(entity, { center: pointOf(entity.groups, 10), radius: numberOf(entity.groups, 40) })
      if (entityName === 'ELLIPSE') {
        Object.assign(entity, {
          center: pointOf(entity.groups, 10),
          majorAxisEndPoint: pointOf(entity.groups, 11),
          axisRatio: numberOf(entity.groups, 40),
          startAngle: numberOf(entity.groups, 41),
          endAngle: numberOf(entity.groups, 42),
        })
      }
      return entity
    }
  }
}

/** The last value of a numeric group, as dxf-parser keeps the last one it reads. */
function numberOf(groups: RawGroupEntity['groups'], code: number): number | undefined {
  for (let index = groups.length - 1; index >= 0; index--) if (groups[index]![0] === code && typeof groups[index]![1] === 'number') return groups[index]![1] as number
  return undefined
}

/** The point of groups code, code + 10, code + 20 (x, y, z: DXF's convention), undefined without x and y. */
function pointOf(groups: RawGroupEntity['groups'], code: number): IPoint | undefined {
  const x = numberOf(groups, code)
  const y = numberOf(groups, code + 10)
  if (x === undefined || y === undefined) return undefined
  const z = numberOf(groups, code + 20)
  return z === undefined ? { x, y, z: 0 } : { x, y, z }
}
