export interface Rgba {
  r: number
  g: number
  b: number
  a: number
}

// CSS Color Level 4 §6.1: the basic colour keywords (plus orange), enough for hand-written files; drawing programs export hex.
const NAMED_COLOURS: Record<string, string> = {
  black: '#000000', silver: '#c0c0c0', gray: '#808080', grey: '#808080', white: '#ffffff',
  maroon: '#800000', red: '#ff0000', purple: '#800080', fuchsia: '#ff00ff', magenta: '#ff00ff',
  green: '#008000', lime: '#00ff00', olive: '#808000', yellow: '#ffff00', navy: '#000080',
  blue: '#0000ff', teal: '#008080', aqua: '#00ffff', cyan: '#00ffff', orange: '#ffa500',
}

const HEX_PATTERN = /^#([0-9a-f]{3,4}|[0-9a-f]{6}|[0-9a-f]{8})$/i
const RGB_FUNCTION_PATTERN = /^rgba?\(\s*([^)]*)\)$/i

/** A CSS colour value as 8-bit sRGB, or undefined when it is not one Kerfbook reads. */
export function parseColour(value: string): Rgba | undefined {
  const text = value.trim().toLowerCase()
  if (text === 'transparent') return { r: 0, g: 0, b: 0, a: 0 }
  const hex = HEX_PATTERN.exec(NAMED_COLOURS[text] ?? text)
  if (hex) return parseHexDigits(hex[1]!)
  const rgb = RGB_FUNCTION_PATTERN.exec(text)
  if (rgb) return parseRgbArguments(rgb[1]!)
  return undefined
}

function parseHexDigits(digits: string): Rgba {
  const long = digits.length <= 4 ? [...digits].map((digit) => digit + digit).join('') : digits
  const channel = (index: number) => Number.parseInt(long.slice(index * 2, index * 2 + 2), 16)
  return { r: channel(0), g: channel(1), b: channel(2), a: long.length === 8 ? channel(3) / 255 : 1 }
}

function parseRgbArguments(argumentText: string): Rgba | undefined {
  const parts = argumentText.split(/[\s,/]+/).filter(Boolean)
  if (parts.length < 3 || parts.length > 4) return undefined
  const channels = parts.slice(0, 3).map((part) => (part.endsWith('%') ? (Number.parseFloat(part) * 255) / 100 : Number.parseFloat(part)))
  const alpha = parts[3] === undefined ? 1 : parseOpacity(parts[3])
  if (channels.some((channel) => !Number.isFinite(channel))) return undefined
  // Three channels: the length is checked above.
  const [r, g, b] = channels.map((channel) => Math.min(255, Math.max(0, Math.round(channel)))) as [number, number, number]
  return { r, g, b, a: alpha }
}

/** An opacity value (number or percentage) clamped to 0–1; unreadable values count as opaque, as CSS ignores them. */
export function parseOpacity(value: string | undefined): number {
  if (value === undefined) return 1
  const text = value.trim()
  const number = text.endsWith('%') ? Number.parseFloat(text) / 100 : Number.parseFloat(text)
  return Number.isFinite(number) ? Math.min(1, Math.max(0, number)) : 1
}

export function toHex({ r, g, b }: Rgba): string {
  return `#${[r, g, b].map((channel) => channel.toString(16).padStart(2, '0')).join('')}`
}

export function rgbDistance(first: Rgba, second: Rgba): number {
  return Math.hypot(first.r - second.r, first.g - second.g, first.b - second.b)
}
