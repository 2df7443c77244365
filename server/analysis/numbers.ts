import { AnalysisInputError } from './errors'

// The SVG/CSS number grammar; anything else (NaN, Infinity, "1,5") is refused rather than guessed.
const NUMBER_PATTERN = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/

/** A finite number from an attribute, `fallback` when absent, a member-readable error when invalid. */
export function parseNumberAttribute(value: string | undefined, attributeName: string, fallback: number): number {
  if (value === undefined || value.trim() === '') return fallback
  const trimmed = value.trim()
  const number = Number(trimmed)
  if (!NUMBER_PATTERN.test(trimmed) || !Number.isFinite(number)) {
    throw new AnalysisInputError('badNumber', `The attribute ${attributeName}="${shorten(value)}" is not a valid number.`)
  }
  return number
}

/** A whitespace/comma separated list of finite numbers (points, viewBox). */
export function parseNumberList(value: string, attributeName: string): number[] {
  const trimmed = value.trim()
  if (trimmed === '') return []
  return trimmed.split(/[\s,]+/).map((part) => parseNumberAttribute(part, attributeName, Number.NaN))
}

export function shorten(text: string): string {
  return text.length > 40 ? `${text.slice(0, 40)}…` : text
}
