// Findings travel in groups (one per kind and cause) with statistics; every site's position comes packed
// from a route of its own; members give one reason per group; lists read summary columns.
import { describe, expect, it } from 'vitest'
import { decodeGeometry, decodeSites } from '../../shared/packed-analysis'
import { plainPart, slitPairs } from '../fixtures/svg'
import { signedIn, waitForMail } from './helpers'

const PAIRS = 12
// Web between two slit centre-lines 1.0 mm apart less the demo laser's 0.2 mm kerf: 0.8 mm (the
// engine's rule, web = centre-line distance − kerf; plain arithmetic on the drawn geometry).
const GAP_MM = 1
const KERF_MM = 0.2

function fileForm(svg: string, name: string) {
  const form = new FormData()
  form.set('file', new Blob([svg], { type: 'image/svg+xml' }), name)
  return form
}

async function jobWith(member: Awaited<ReturnType<typeof signedIn>>, svg: string, title: string) {
  const overview = (await member.get('/api/catalog/overview')).body as any[]
  const heron = overview.find((c) => c.name.startsWith('Heron'))
  const created = await member.post('/api/jobs', { title, cutterId: heron.cutterId, materialId: heron.materials.find((m: any) => m.name === 'Birch plywood').materialId })
  const jobId = created.body.id as number
  const added = await member.form(`/api/jobs/${jobId}/files`, fileForm(svg, 'pairs.svg'))
  expect(added.status).toBe(201)
  return { jobId, fileId: added.body.fileId as number }
}

describe('grouped findings', () => {
  it('reports one group per kind with its count and statistics, and every site in the packed table', async () => {
    const member = await signedIn('member@example.test')
    const { jobId, fileId } = await jobWith(member, slitPairs(PAIRS, GAP_MM), 'Twelve hinges')
    const revision = (await member.get(`/api/jobs/${jobId}/files/${fileId}/revisions/1`)).body
    expect(revision.findings).toBeUndefined()
    const bridges = revision.findingGroups.find((g: any) => g.code === 'narrow-bridge')
    expect(bridges.severity).toBe('warning')
    expect(bridges.count).toBe(PAIRS)
    expect(bridges.stats.min).toBeCloseTo(GAP_MM - KERF_MM, 6)
    expect(bridges.stats.max).toBeCloseTo(GAP_MM - KERF_MM, 6)
    expect(bridges.stats.histogram.counts.reduce((a: number, b: number) => a + b, 0)).toBe(PAIRS)
    const slits = revision.findingGroups.find((g: any) => g.code === 'open-contour')
    expect(slits.count).toBe(2 * PAIRS)
    expect(revision.counts.warnings).toBe(revision.findingGroups.filter((g: any) => g.severity === 'warning').reduce((n: number, g: any) => n + g.count, 0))

    const sitesAnswer = await member.bytes(`/api/jobs/${jobId}/files/${fileId}/revisions/1/sites`)
    expect(sitesAnswer.status).toBe(200)
    const sites = decodeSites(sitesAnswer.body)
    expect(sites.count).toBe(revision.findingGroups.reduce((n: number, g: any) => n + g.count, 0))
    const bridgeRows = Array.from({ length: bridges.count }, (_, i) => bridges.firstSite + i)
    // Each bridge lies between the two slits of its pair (x within the slits, y between the centre-lines).
    const pairOf = bridgeRows.map((row) => Math.round((sites.xy[2 * row + 1]! - 10 - GAP_MM / 2) / 8))
    expect(new Set(pairOf).size).toBe(PAIRS)
    for (const row of bridgeRows) {
      const [x, y] = [sites.xy[2 * row]!, sites.xy[2 * row + 1]!]
      expect(x).toBeGreaterThanOrEqual(15)
      expect(x).toBeLessThanOrEqual(55)
      const pairTop = 10 + 8 * Math.round((y - 10 - GAP_MM / 2) / 8)
      expect(y).toBeGreaterThanOrEqual(pairTop - 1e-3)
      expect(y).toBeLessThanOrEqual(pairTop + GAP_MM + 1e-3)
      expect(sites.value[row]).toBeCloseTo(GAP_MM - KERF_MM, 5)
      expect(sites.contourB[row]).toBeGreaterThanOrEqual(0)
    }
    const geometry = decodeGeometry((await member.bytes(`/api/jobs/${jobId}/files/${fileId}/revisions/1/geometry`)).body)
    expect(geometry.count).toBe(1 + 2 * PAIRS)
    for (const row of bridgeRows) expect(sites.contourA[row]).toBeLessThan(geometry.count)

    // The job list and the job detail count the same, from the summary columns.
    const listed = ((await member.get('/api/jobs')).body as any[]).find((j) => j.id === jobId)
    const detail = (await member.get(`/api/jobs/${jobId}`)).body
    expect(listed.findings).toEqual(detail.findings)
    expect(detail.findings).toEqual(revision.counts)
    expect(JSON.stringify(detail)).not.toMatch(/"sites"|"xy"/)
  })

  it('keeps the summary columns in step when a file gets a new revision', async () => {
    const member = await signedIn('member@example.test')
    const { jobId, fileId } = await jobWith(member, slitPairs(3, GAP_MM), 'Fixed later')
    expect(((await member.get('/api/jobs')).body as any[]).find((j) => j.id === jobId).findings.warnings).toBe(3)
    await member.form(`/api/jobs/${jobId}/files/${fileId}/revisions`, fileForm(plainPart(), 'fixed.svg'))
    const listed = ((await member.get('/api/jobs')).body as any[]).find((j) => j.id === jobId)
    expect(listed.findings.warnings).toBe(0)
    expect(listed.worstFinding).toBeNull()
    const detail = (await member.get(`/api/jobs/${jobId}`)).body
    expect(detail.files[0].current.cut.lengthMm).toBeCloseTo(2 * (80 + 50) + 2 * Math.PI * 8, 1)
    expect(detail.files[0].change.findings).toBeLessThan(0)
  })

  it('asks for one reason per group of warnings, and not again for a revision already acknowledged', async () => {
    const member = await signedIn('member@example.test')
    const staff = await signedIn('staff@example.test')
    const { jobId, fileId } = await jobWith(member, slitPairs(PAIRS, GAP_MM), 'Reasons per group')
    const detail = (await member.get(`/api/jobs/${jobId}`)).body
    const warningGroups = detail.warningGroups
    expect(warningGroups.length).toBe(detail.findings.warningGroups)
    expect(warningGroups.every((g: any) => g.acknowledgement === null)).toBe(true)

    const tooShort = await member.post(`/api/jobs/${jobId}/submit`, { acknowledgements: warningGroups.map((g: any) => ({ fileId, revision: 1, key: g.group.key, reason: 'ok' })) })
    expect(tooShort.status).toBe(400)
    const foreignKey = await member.post(`/api/jobs/${jobId}/submit`, { acknowledgements: [{ fileId, revision: 1, key: 'no-such-group', reason: 'A reason long enough.' }] })
    expect(foreignKey.status).toBe(400)
    expect((await member.get(`/api/jobs/${jobId}`)).body.state).toBe('draft')

    const reasons = warningGroups.map((g: any, i: number) => ({ fileId, revision: 1, key: g.group.key, reason: `Hinges fold by design (${i}).` }))
    expect((await member.post(`/api/jobs/${jobId}/submit`, { acknowledgements: reasons })).status).toBe(200)
    const submitted = (await staff.get(`/api/jobs/${jobId}`)).body
    expect(submitted.warningGroups.map((g: any) => g.acknowledgement.reason)).toEqual(reasons.map((r: any) => r.reason))
    expect(submitted.events.at(-1).comment).toMatch(new RegExp(`${warningGroups.length} groups? of warnings acknowledged \\(${detail.findings.warnings} places?\\)`))

    // Sent back without a new revision: the reasons stand, nothing more is asked.
    expect((await staff.post(`/api/jobs/${jobId}/request-changes`, { comment: 'Please check the copies.', findingRef: { fileId, revision: 1, key: warningGroups[0].group.key } })).status).toBe(200)
    const pointedAt = `${warningGroups[0].group.count} places in pairs (revision 1)`
    expect((await member.get(`/api/jobs/${jobId}`)).body.events.at(-1).finding).toContain(pointedAt)
    expect((await waitForMail('member@example.test', /Changes asked for: Reasons per group/)).text).toContain(pointedAt)
    expect((await member.post(`/api/jobs/${jobId}/submit`, {})).status).toBe(200)
  })

  it('serves packed geometry and sites to the owner and staff only, compressed and cacheable for good', async () => {
    const member = await signedIn('member@example.test')
    const other = await signedIn('ines@example.test')
    const staff = await signedIn('staff@example.test')
    const { jobId, fileId } = await jobWith(member, slitPairs(2, GAP_MM), 'Packed routes')
    const url = `/api/jobs/${jobId}/files/${fileId}/revisions/1/geometry`
    const first = await member.bytes(url, { 'accept-encoding': 'gzip' })
    expect(first.status).toBe(200)
    expect(first.headers.get('cache-control')).toMatch(/immutable/)
    expect(first.headers.get('content-type')).toBe('application/octet-stream')
    const etag = first.headers.get('etag')!
    expect((await member.bytes(url, { 'if-none-match': etag })).status).toBe(304)
    expect((await staff.bytes(url)).status).toBe(200)
    expect((await other.bytes(url)).status).toBe(404)
    expect((await other.bytes(`/api/jobs/${jobId}/files/${fileId}/revisions/1/sites`)).status).toBe(404)
    expect((await member.bytes(`/api/jobs/${jobId}/files/${fileId}/revisions/2/geometry`)).status).toBe(404)
    expect((await member.bytes(`/api/jobs/${jobId}/files/${fileId}/revisions/1/contours`)).status).toBe(400)
    // Without gzip the same bytes come plain.
    const plain = await member.bytes(url, { 'accept-encoding': 'identity' })
    expect(plain.headers.get('content-encoding')).toBeNull()
    expect(Buffer.from(plain.body).equals(Buffer.from(first.body))).toBe(true)
  })
})
