// CSV cells never start a formula, whichever list separator the spreadsheet's locale uses. Read back with
// papaparse (an RFC 4180 reader from npm) using the comma, the semicolon, the tab and the bar.
import Papa from 'papaparse'
import { describe, expect, it } from 'vitest'
import { toCsv } from '../../server/utils/csv'

const HOSTILE_TITLES = [
  'Part;=1+1;',
  'Part\t=HYPERLINK("http://evil.example")',
  'Part|@SUM(A1)',
  'Part, -2+3',
  '=1+1',
  '+1+1',
  '-1+1',
  '@SUM(A1:A2)',
  '  =1+1',
  '\t=1+1',
  '\r=1+1',
  '＝1+1',
  'line one\n=1+1',
  'a "quoted" ; =cmd',
]
// Formula starters per OWASP "CSV Injection", plus the full-width forms some locales accept.
const STARTS_FORMULA = /^\s*[=+\-@＝＋－＠]/

describe('CSV export', () => {
  const csv = toCsv(['title', 'minutes'], HOSTILE_TITLES.map((title, i) => [title, -i]))

  it.each([',', ';', '\t', '|'])('has no cell that starts a formula when read with %j as the separator', (delimiter) => {
    // Read with another separator than the file's comma, a quoted field runs on past its closing quote
    // (papaparse reports that, and spreadsheets do the same): what matters is how each cell starts.
    const { data } = Papa.parse<string[]>(csv, { delimiter, newline: '\r\n', skipEmptyLines: true })
    // A plain number such as -3 is a number to a spreadsheet, not a formula.
    const textCells = data.slice(1).flat().filter((cell) => !/^-?\d+$/.test(cell))
    for (const cell of textCells) expect(cell, JSON.stringify(cell)).not.toMatch(STARTS_FORMULA)
  })

  it('reads back with the comma as the text it was, behind a single quote where it started like a formula', () => {
    const { data } = Papa.parse<string[]>(csv, { delimiter: ',', newline: '\r\n', skipEmptyLines: true })
    const titles = data.slice(1).map((row) => row[0])
    expect(titles).toEqual(HOSTILE_TITLES.map((t) => (STARTS_FORMULA.test(t) || /^[\t\r]/.test(t) ? `'${t}` : t)))
    // Numbers stay numbers, negative ones included.
    expect(data.slice(1).map((row) => row[1])).toEqual(HOSTILE_TITLES.map((_, i) => String(-i)))
  })
})
