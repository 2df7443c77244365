import { existsSync, readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, inject, it } from 'vitest'
import { crossingCuts, plainPart, slitPair } from '../fixtures/svg'
import { decodeGeometry } from '../../shared/packed-analysis'
import type { client } from './helpers'
import { signedIn, sqlRow, waitForMail } from './helpers'

function fileForm(svg: string, name: string, quantity = 1) {
  const form = new FormData()
  form.set('file', new Blob([svg], { type: 'image/svg+xml' }), name)
  form.set('quantity', String(quantity))
  return form
}

async function laserPlywood() {
  const member = await signedIn('member@example.test')
  const overview = (await member.get('/api/catalog/overview')).body as any[]
  const heron = overview.find((c) => c.name.startsWith('Heron'))
  return { cutterId: heron.cutterId as number, materialId: heron.materials.find((m: any) => m.name === 'Birch plywood').materialId as number }
}

async function newJob(member: ReturnType<typeof client>, title = 'Folding lamp shade') {
  const created = await member.post('/api/jobs', { title, ...(await laserPlywood()) })
  expect(created.status).toBe(201)
  return created.body.id as number
}

async function eventCount(jobId: number): Promise<number> {
  return (await sqlRow<{ n: number }>('select count(*) as n from job_events where job_id = ?', [jobId]))!.n
}

describe('uploading files to a job', () => {
  it('stores and analyses the good files and refuses a hostile and an oversized one with reasons', async () => {
    const member = await signedIn('member@example.test')
    const jobId = await newJob(member)
    const hostile = `<svg xmlns="http://www.w3.org/2000/svg" width="50mm" height="50mm" viewBox="0 0 50 50" onload="alert('owned')"><script>alert('owned')</script><rect x="5" y="5" width="40" height="40" fill="none" stroke="#ff6a00"/></svg>`
    const oversized = `<svg xmlns="http://www.w3.org/2000/svg">${' '.repeat(21 * 1024 * 1024)}</svg>`

    const results = await Promise.all([
      member.form(`/api/jobs/${jobId}/files`, fileForm(plainPart(), 'side-panel.svg', 4)),
      member.form(`/api/jobs/${jobId}/files`, fileForm(plainPart(60, 40), 'end-cap.svg', 2)),
      member.form(`/api/jobs/${jobId}/files`, fileForm(hostile, 'hostile.svg')),
      member.form(`/api/jobs/${jobId}/files`, fileForm(oversized, 'huge.svg')),
    ])
    expect(results.map((r) => r.status)).toEqual([201, 201, 422, 413])
    expect(results[2]!.body.message).toMatch(/script/)
    expect(results[3]!.body.message).toMatch(/20 MB/)

    const job = (await member.get(`/api/jobs/${jobId}`)).body
    expect(job.files.map((f: any) => f.name).sort()).toEqual(['end-cap', 'side-panel'])
    // Closed forms: a rectangle's perimeter plus 2πr of the r = 8 mm hole, per copy.
    const sidePanel = job.files.find((f: any) => f.name === 'side-panel')
    expect(sidePanel.current.cut.lengthMm).toBeCloseTo(2 * (80 + 50) + 2 * Math.PI * 8, 1)
    expect(job.estimate.cutLengthMm).toBeCloseTo(4 * (260 + 16 * Math.PI) + 2 * (200 + 16 * Math.PI), 0)
    expect(job.estimate.pierces).toBe(4 * 2 + 2 * 2)
    expect(job.estimate.sheetCount).toBeGreaterThanOrEqual(1)
    expect(job.estimate.totalPriceMinor).toBe(job.estimate.machinePriceMinor + job.estimate.materialPriceMinor)

    // Nothing of the hostile upload was kept or can come back in a page.
    const uploads = inject('uploadsDir')
    const stored = existsSync(uploads) ? readdirSync(uploads).flatMap((d) => readdirSync(join(uploads, d)).map((f) => readFileSync(join(uploads, d, f), 'utf8'))) : []
    expect(stored.some((text) => text.includes('owned'))).toBe(false)
    const page = await fetch(`${inject('baseUrl')}/jobs/${jobId}`, { headers: { accept: 'text/html' } })
    expect(await page.text()).not.toContain("alert('owned')")
  })

  it('keeps every revision and its analysis when a file is replaced, and shows what changed', async () => {
    const member = await signedIn('member@example.test')
    const jobId = await newJob(member, 'Revision test')
    const added = await member.form(`/api/jobs/${jobId}/files`, fileForm(plainPart(80, 50), 'bracket.svg'))
    const fileId = added.body.fileId
    const replaced = await member.form(`/api/jobs/${jobId}/files/${fileId}/revisions`, fileForm(plainPart(100, 50), 'bracket-v2.svg'))
    expect(replaced.status).toBe(201)
    expect(replaced.body.revision).toBe(2)

    const first = (await member.get(`/api/jobs/${jobId}/files/${fileId}/revisions/1`)).body
    const second = (await member.get(`/api/jobs/${jobId}/files/${fileId}/revisions/2`)).body
    expect(first.cut.lengthMm).toBeCloseTo(260 + 16 * Math.PI, 1)
    expect(second.cut.lengthMm).toBeCloseTo(300 + 16 * Math.PI, 1)
    const geometry = await member.bytes(`/api/jobs/${jobId}/files/${fileId}/revisions/1/geometry`)
    expect(decodeGeometry(geometry.body).count).toBe(2)

    const job = (await member.get(`/api/jobs/${jobId}`)).body
    const file = job.files[0]
    expect(file.revisions.map((r: any) => r.revision)).toEqual([2, 1])
    expect(file.change.cutLengthMm).toBeCloseTo(40, 1)
  })

  it('lays the copies out on stock sheets that hold them without overlap', async () => {
    const member = await signedIn('member@example.test')
    const jobId = await newJob(member, 'Layout test')
    // 600 × 400 mm plywood sheets: 30 copies of a 90 × 60 mm part need more than one.
    await member.form(`/api/jobs/${jobId}/files`, fileForm(plainPart(), 'tile.svg', 30))
    const { estimate, sheet } = (await member.get(`/api/jobs/${jobId}`)).body
    expect(estimate.layout.sheets.length).toBe(estimate.sheetCount)
    const placed = estimate.layout.sheets.flatMap((s: any) => s.placements)
    expect(placed.length).toBe(30)
    for (const s of estimate.layout.sheets) {
      for (const p of s.placements) {
        expect(p.x).toBeGreaterThanOrEqual(0)
        expect(p.y).toBeGreaterThanOrEqual(0)
        expect(p.x + p.widthMm).toBeLessThanOrEqual(sheet.widthMm)
        expect(p.y + p.heightMm).toBeLessThanOrEqual(sheet.heightMm)
      }
    }
    expect(estimate.materialPriceMinor).toBe(estimate.sheetCount * sheet.priceMinor)
  })
})

describe('the way through review', () => {
  it('submit → changes asked → submit → approve, one audit row per move, mails to the right people', async () => {
    const member = await signedIn('member@example.test')
    const staff = await signedIn('staff@example.test')
    const jobId = await newJob(member, 'Pavilion shingles')
    await member.form(`/api/jobs/${jobId}/files`, fileForm(plainPart(), 'shingle.svg', 3))
    const before = await eventCount(jobId)

    expect((await member.post(`/api/jobs/${jobId}/approve`)).status).toBe(403)
    expect((await staff.post(`/api/jobs/${jobId}/approve`)).status).toBe(409)
    expect(await eventCount(jobId)).toBe(before)

    expect((await member.post(`/api/jobs/${jobId}/submit`, {})).status).toBe(200)
    expect(await eventCount(jobId)).toBe(before + 1)
    const toStaff = await waitForMail('staff@example.test', /New job to review: Pavilion shingles/)
    expect(toStaff.text).toContain(`/jobs/${jobId}`)

    expect((await staff.post(`/api/jobs/${jobId}/request-changes`, { comment: '' })).status).toBe(400)
    expect((await staff.post(`/api/jobs/${jobId}/request-changes`, { comment: 'Please add a 5 mm margin around the shingles.' })).status).toBe(200)
    expect(await eventCount(jobId)).toBe(before + 2)
    const changes = await waitForMail('member@example.test', /Changes asked for: Pavilion shingles/)
    expect(changes.text).toContain('5 mm margin')

    expect((await member.post(`/api/jobs/${jobId}/submit`, {})).status).toBe(200)
    const approved = await staff.post(`/api/jobs/${jobId}/approve`, {})
    expect(approved.status).toBe(200)
    expect(approved.body).toMatchObject({ from: 'submitted', to: 'approved' })
    expect(await eventCount(jobId)).toBe(before + 4)
    await waitForMail('member@example.test', /Approved: Pavilion shingles/)

    const job = (await member.get(`/api/jobs/${jobId}`)).body
    expect(job.state).toBe('approved')
    expect(job.events.map((e: any) => e.to)).toEqual(['draft', 'submitted', 'changes_requested', 'submitted', 'approved'])
    expect(job.actions).toContain('withdraw')
    // Files can't change once approved.
    expect((await member.form(`/api/jobs/${jobId}/files`, fileForm(plainPart(), 'late.svg'))).status).toBe(409)
  })

  it('blocks submission on errors until staff record an override, and asks for an acknowledgement of warnings', async () => {
    const member = await signedIn('member@example.test')
    const staff = await signedIn('staff@example.test')
    const erroneous = await newJob(member, 'Crossing cuts')
    await member.form(`/api/jobs/${erroneous}/files`, fileForm(crossingCuts(), 'crossing.svg'))
    const blocked = await member.post(`/api/jobs/${erroneous}/submit`, {})
    expect(blocked.status).toBe(400)
    expect(blocked.body.message).toMatch(/fixing/)
    expect((await member.post(`/api/jobs/${erroneous}/override`, { reason: 'I say so' })).status).toBe(403)
    expect((await staff.post(`/api/jobs/${erroneous}/override`, { reason: 'The overlap is a deliberate drop-out window.' })).status).toBe(200)
    expect((await member.post(`/api/jobs/${erroneous}/submit`, {})).status).toBe(200)

    const warned = await newJob(member, 'Thin bridges')
    // 1.0 mm between slit centre-lines with the demo 0.2 mm kerf leaves 0.8 mm, under the 3 mm minimum.
    await member.form(`/api/jobs/${warned}/files`, fileForm(slitPair(1), 'slits.svg'))
    const detail = (await member.get(`/api/jobs/${warned}`)).body
    expect(detail.findings.warnings).toBeGreaterThan(0)
    const noNote = await member.post(`/api/jobs/${warned}/submit`, {})
    expect(noNote.status).toBe(400)
    expect(noNote.body.data.fields.acknowledgement).toBeTruthy()
    expect((await member.post(`/api/jobs/${warned}/submit`, { acknowledgement: 'The 0.8 mm bridge is meant to fold.' })).status).toBe(200)
    const submitted = (await member.get(`/api/jobs/${warned}`)).body
    expect(submitted.warningGroups.length).toBe(detail.findings.warningGroups)
    for (const group of submitted.warningGroups) expect(group.acknowledgement.reason).toBe('The 0.8 mm bridge is meant to fold.')
  })

  it('lets the member withdraw, and staff reject with a reason', async () => {
    const member = await signedIn('member@example.test')
    const staff = await signedIn('staff@example.test')
    const first = await newJob(member, 'Withdraw me')
    expect((await member.post(`/api/jobs/${first}/withdraw`)).status).toBe(200)
    expect((await member.post(`/api/jobs/${first}/withdraw`)).status).toBe(409)

    const second = await newJob(member, 'Reject me')
    await member.form(`/api/jobs/${second}/files`, fileForm(plainPart(), 'part.svg'))
    await member.post(`/api/jobs/${second}/submit`, {})
    expect((await staff.post(`/api/jobs/${second}/reject`, {})).status).toBe(400)
    expect((await staff.post(`/api/jobs/${second}/reject`, { comment: 'Sheet metal this thin is out of stock until spring.' })).status).toBe(200)
    await waitForMail('member@example.test', /Not accepted: Reject me/)
  })
})

describe('who sees what', () => {
  it("answers 404 for another member's job, and staff see everyone's in the queue", async () => {
    const member = await signedIn('member@example.test')
    const other = await signedIn('ines@example.test')
    const jobId = await newJob(member, 'Private job')
    expect((await other.get(`/api/jobs/${jobId}`)).status).toBe(404)
    expect((await other.form(`/api/jobs/${jobId}/files`, fileForm(plainPart(), 'x.svg'))).status).toBe(404)
    expect((await other.post(`/api/jobs/${jobId}/withdraw`)).status).toBe(404)
    expect(((await other.get('/api/jobs')).body as any[]).some((j) => j.id === jobId)).toBe(false)
    expect(((await other.get('/api/jobs?scope=all')).body as any[]).some((j) => j.id === jobId)).toBe(false)
    const queue = (await (await signedIn('staff@example.test')).get('/api/jobs?scope=all')).body as any[]
    expect(queue.some((j) => j.id === jobId)).toBe(true)
  })

  it('refuses a job for a material the cutter may not take', async () => {
    const member = await signedIn('member@example.test')
    const { cutterId } = await laserPlywood()
    const materials = (await member.get('/api/catalog/materials')).body as any[]
    const pvc = materials.find((m) => m.name === 'PVC foam board')
    const response = await member.post('/api/jobs', { title: 'Sign', cutterId, materialId: pvc.id })
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(/chlorine/i)
  })
})
