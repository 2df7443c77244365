import { parseColour, rgbDistance, type Rgba } from './colour'
import type { ColourRule, Operation } from './params'

interface ParsedRule {
  colour: Rgba
  toleranceRgbDistance: number
  operation: Operation
}

/** Looks colours up in the workshop's mapping: the nearest rule within its tolerance wins. */
export class ColourMapper {
  private readonly rules: ParsedRule[]
  private readonly cache = new Map<string, Operation | undefined>()

  constructor(mapping: ColourRule[]) {
    this.rules = mapping.flatMap((rule) => {
      const colour = parseColour(rule.hex)
      return colour ? [{ colour, toleranceRgbDistance: rule.toleranceRgbDistance, operation: rule.operation }] : []
    })
  }

  operationFor(colour: Rgba, hex: string): Operation | undefined {
    if (this.cache.has(hex)) return this.cache.get(hex)
    let best: ParsedRule | undefined
    let bestDistance = Number.POSITIVE_INFINITY
    for (const rule of this.rules) {
      const distance = rgbDistance(colour, rule.colour)
      if (distance <= rule.toleranceRgbDistance && distance < bestDistance) {
        best = rule
        bestDistance = distance
      }
    }
    this.cache.set(hex, best?.operation)
    return best?.operation
  }
}
