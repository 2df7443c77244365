import { execFileSync } from 'node:child_process'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'
import type { AnalysisResult } from '../../server/analysis/index'

// The command-line analysis (scripts/analyze.ts) run as a member would run it, with --json.
const folder = mkdtempSync(join(tmpdir(), 'kerfbook-cli-'))
afterAll(() => rmSync(folder, { recursive: true, force: true }))

function analyseFile(name: string, text: string, ...options: string[]): AnalysisResult {
  const file = join(folder, name)
  writeFileSync(file, text)
  const output = execFileSync(join('node_modules', '.bin', 'tsx'), ['scripts/analyze.ts', file, '--json', ...options], { encoding: 'utf8' })
  return JSON.parse(output) as AnalysisResult
}

const codes = (result: AnalysisResult) => result.findingGroups.map((group) => group.code)

// A 50 × 30 plate with a Ø5 mm hole, in the README's demo colours: #ff6a00 cuts, #7a3cff scores.
const plate = `<svg xmlns="http://www.w3.org/2000/svg" width="60mm" height="40mm" viewBox="0 0 60 40">
<rect x="5" y="5" width="50" height="30" fill="none" stroke="#ff6a00"/>
<circle cx="30" cy="20" r="2.5" fill="none" stroke="#ff6a00"/>
<path d="M10 10H20" fill="none" stroke="#7a3cff"/></svg>`

// Each case starts tsx (a second or two, more on a busy machine): a generous timeout, not a speed goal.
describe('npm run analyze', { timeout: 60_000 }, () => {
  it('reads the README demo colours with the default profile: cut and score, no unknown colour', () => {
    const result = analyseFile('plate.svg', plate)
    expect(codes(result)).not.toContain('unmapped-colour')
    expect(result.score.lengthMm).toBeCloseTo(10, 9)
    // Perimeter 2(50 + 30) plus the hole's circumference 5π (closed forms), within the 0.01 mm chord tolerance.
    expect(Math.abs(result.cut.lengthMm - (160 + 5 * Math.PI))).toBeLessThan(0.02)
  })

  it('moves the minimum hole with --thickness: a Ø5 mm hole is fine in 3 mm and small in 6 mm', () => {
    // Minimum hole = the thickness (params.ts, common practice, no source), as --help documents.
    expect(codes(analyseFile('plate.svg', plate))).not.toContain('small-hole')
    const thick = analyseFile('plate.svg', plate, '--thickness', '6')
    const smallHole = thick.findingGroups.find((group) => group.code === 'small-hole')
    expect(smallHole).toMatchObject({ count: 1, facts: { limitMm: 6 } })
  })

  it('keeps a --min-hole given beside --thickness', () => {
    expect(codes(analyseFile('plate.svg', plate, '--thickness', '6', '--min-hole', '4'))).not.toContain('small-hole')
  })

  it('reads the demo workshop layers in a DXF: a LINE on layer CUT is cut without an unknown-layer finding', () => {
    const dxf = ['0', 'SECTION', '2', 'HEADER', '9', '$INSUNITS', '70', '4', '0', 'ENDSEC', '0', 'SECTION', '2', 'ENTITIES', '0', 'LINE', '8', 'CUT', '62', '5', '10', '0', '20', '0', '30', '0', '11', '25', '21', '0', '31', '0', '0', 'ENDSEC', '0', 'EOF', ''].join('\n')
    const result = analyseFile('line.dxf', dxf)
    expect(result.cut.lengthMm).toBeCloseTo(25, 9)
    expect(codes(result)).not.toContain('unmapped-colour')
  })
})
