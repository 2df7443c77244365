import { AnalysisInputError } from './errors'

/** The SVG/CSS number grammar (sign, digits with an optional point, optional exponent), as regular-expression source. */
export const NUMBER_GRAMMAR = String.raw`[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?`
// One whole number of that grammar; anything else (NaN, Infinity, "1,5") is refused rather than guessed.
export const NUMBER_PATTERN = new RegExp(`^${NUMBER_GRAMMAR}$`)

/** A finite number from an attribute, `fallback` when absent, a member-readable error when invalid. */
export function parseNumberAttribute(value: string | undefined, attributeName: string, fallback: number): number {
  if (value === undefined || value.trim() === '') return fallback
  const trimmed = value.trim()
  const number = Number(trimmed)
  if (!NUMBER_PATTERN.test(trimmed) || !Number.isFinite(number)) throw invalidNumber(attributeName, value)
  return number
}

// One number of that grammar, then the separators after it (sticky: matched where the scan is, never searched for).
// Each scan takes its own copies (a sticky pattern carries its position), so no state outlives a call.
const LIST_ITEM_PATTERN = new RegExp(`(${NUMBER_GRAMMAR})(?:[\\s,]+|$)`, 'y')
const SEPARATORS_PATTERN = /[\s,]*/y

/**
 * A whitespace/comma separated list of finite numbers (points, viewBox).
 * One sticky scan, with no list of substrings: a polyline-heavy drawing
 * reads its points in a fraction of the time split-and-test takes.
 */
export function parseNumberList(value: string, attributeName: string): number[] {
  const numbers: number[] = []
  const separators = new RegExp(SEPARATORS_PATTERN)
  const item = new RegExp(LIST_ITEM_PATTERN)
  separators.test(value)
  let index = separators.lastIndex
  while (index < value.length) {
    item.lastIndex = index
    const match = item.exec(value)
    const number = match === null ? Number.NaN : Number(match[1])
    if (match === null || !Number.isFinite(number)) throw invalidNumber(attributeName, badItemAt(value, index))
    numbers.push(number)
    index = item.lastIndex
  }
  return numbers
}

/** The item of a list that starts at `index`, up to the next separator, for the error message. */
function badItemAt(value: string, index: number): string {
  const end = value.slice(index).search(/[\s,]/)
  return end < 0 ? value.slice(index) : value.slice(index, index + end)
}

function invalidNumber(attributeName: string, value: string): AnalysisInputError {
  return new AnalysisInputError('badNumber', `The attribute ${attributeName}="${shorten(value)}" is not a valid number.`)
}

export function shorten(text: string): string {
  return text.length > 40 ? `${text.slice(0, 40)}…` : text
}
