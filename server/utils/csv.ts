// RFC 4180 CSV with CRLF line ends, safe to open in a spreadsheet in any locale.
//
// A spreadsheet takes a cell starting with = + - @ (or their full-width forms, or after a tab, CR or
// spaces it skips) as a formula: such text gets a leading ' so it is shown as text (OWASP, "CSV
// Injection"). Locales split on other list separators than the comma (; in much of Europe, tab, |), so
// a field holding any of them is quoted: every spreadsheet keeps a quoted field one cell, and no formula
// can start after a separator inside it. Numbers are written as they are.
const FORMULA_START = /^[\s]*[=+\-@\uFF1D\uFF0B\uFF0D\uFF20]|^[\t\r]/
const NEEDS_QUOTES = /[",;\t|\r\n]/

function field(value: unknown): string {
  let text = value === null || value === undefined ? '' : String(value)
  if (typeof value === 'string' && FORMULA_START.test(text)) text = `'${text}`
  return NEEDS_QUOTES.test(text) ? `"${text.replace(/"/g, '""')}"` : text
}

export function toCsv(header: string[], rows: unknown[][]): string {
  return [header, ...rows].map((row) => row.map(field).join(',')).join('\r\n') + '\r\n'
}
