import type { IEntity } from 'dxf-parser'

/** An entity kept as its group-code/value pairs, for entities dxf-parser does not read (or reads without what Kerfbook needs). */
export interface RawGroupEntity extends IEntity {
  groups: Array<[number, string | number | boolean]>
}

/** The part of dxf-parser's scanner that entity handlers use. */
interface GroupScanner {
  next(): { code: number; value: string | number | boolean }
  isEOF(): boolean
}

/**
 * SPLINE (dxf-parser 1.1.2 drops the weights, group 41, of rational splines),
 * HATCH and IMAGE (it skips them): registered with the parser's own
 * `registerEntityHandler`, so the parser still walks the file.
 */
export const RAW_GROUP_ENTITY_NAMES = ['SPLINE', 'HATCH', 'IMAGE'] as const

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
      return entity
    }
  }
}
