// RFC 4180 CSV: fields with commas, quotes or line breaks are quoted, quotes doubled, CRLF line ends.
// A leading =, +, - or @ is prefixed with ' so a spreadsheet never runs it as a formula.
function field(value: unknown): string {
  let text = value === null || value === undefined ? '' : String(value)
  if (/^[=+\-@]/.test(text) && typeof value === 'string') text = `'${text}`
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text
}

export function toCsv(header: string[], rows: unknown[][]): string {
  return [header, ...rows].map((row) => row.map(field).join(',')).join('\r\n') + '\r\n'
}
