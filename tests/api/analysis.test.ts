import { gunzipSync } from 'node:zlib'
import { describe, expect, it } from 'vitest'
import { decodeGeometry, decodeSites } from '../../shared/packed-analysis'
import { SQUARE_100_MM } from '../fixtures/svg'
import { client, signedIn, svgForm } from './helpers'

async function catalogIds(cutterPrefix: string, materialName: string, thicknessMm: number) {
  const member = await signedIn('member@example.test')
  const cutters = (await member.get('/api/catalog/cutters')).body as { id: number; name: string }[]
  const materials = (await member.get('/api/catalog/materials')).body as { id: number; name: string; thicknessMm: number }[]
  return {
    cutterId: cutters.find((c) => c.name.startsWith(cutterPrefix))!.id,
    materialId: materials.find((m) => m.name === materialName && m.thicknessMm === thicknessMm)!.id,
  }
}

describe('POST /api/analysis', () => {
  it('measures a file with the catalog profile of a cutter and material', async () => {
    const member = await signedIn('member@example.test')
    const ids = await catalogIds('Heron', 'Birch plywood', 3)
    const response = await member.form('/api/analysis', svgForm(SQUARE_100_MM, { ...ids, preview: 1 }))
    expect(response.status).toBe(200)
    const result = response.body
    // Perimeter of a 100 mm square plus circumference 2πr of r = 20 mm (closed forms).
    expect(result.cut.lengthMm).toBeCloseTo(400 + 2 * Math.PI * 20, 1)
    expect(result.cut.pierces).toBe(2)
    expect(result.cut.closedContours).toBe(2)
    expect(result.bbox).toMatchObject({ x: 10, y: 10, width: 100, height: 100 })
    // The demo laser: EUR, billed per whole minute, 5 setup minutes at 85 cents. The engine gives time, the server the price.
    expect(result.price).toBeUndefined()
    expect(result.estimate.currency).toBe('EUR')
    expect(Number.isInteger(result.estimate.billableMinutes)).toBe(true)
    expect(result.time.setupS).toBe(300)
    expect(result.estimate.totalPriceMinor).toBeGreaterThanOrEqual(result.estimate.billableMinutes * 85)
    expect(result.sheet.fits).toBe(true)
    // The preview comes packed and gzip-compressed, as base64, since nothing of a check is stored.
    expect(decodeGeometry(gunzipSync(Buffer.from(result.geometryGz, 'base64'))).count).toBe(2)
    expect(decodeSites(gunzipSync(Buffer.from(result.sitesGz, 'base64'))).count).toBe(result.findingGroups.reduce((n: number, g: { count: number }) => n + g.count, 0))
  })

  it('prices a checked file exactly as the job page prices a job of that one file', async () => {
    const member = await signedIn('member@example.test')
    const ids = await catalogIds('Heron', 'Birch plywood', 3)
    const checked = (await member.form('/api/analysis', svgForm(SQUARE_100_MM, ids))).body
    const job = await member.post('/api/jobs', { title: 'Same price', ...ids })
    expect((await member.form(`/api/jobs/${job.body.id}/files`, svgForm(SQUARE_100_MM))).status).toBe(201)
    const page = (await member.get(`/api/jobs/${job.body.id}`)).body
    expect(checked.estimate).toEqual({
      billableMinutes: page.estimate.billableMinutes,
      machinePriceMinor: page.estimate.machinePriceMinor,
      sheetCount: page.estimate.sheetCount,
      materialPriceMinor: page.estimate.materialPriceMinor,
      totalPriceMinor: page.estimate.totalPriceMinor,
      currency: page.estimate.currency,
    })
    // The price list's rule (README, "A job's price"): cutting minutes rounded up to the increment, then the setup, at the rate; whole sheets.
    const cutter = (await member.get(`/api/catalog/cutters/${ids.cutterId}`)).body
    const material = (await member.get(`/api/catalog/materials/${ids.materialId}`)).body
    const cutMinutes = (checked.time.totalS - checked.time.setupS) / 60
    const billed = Math.ceil(cutMinutes / cutter.billingIncrementMinutes) * cutter.billingIncrementMinutes + cutter.setupMinutes
    expect(checked.estimate.billableMinutes).toBe(billed)
    expect(checked.estimate.totalPriceMinor).toBe(billed * cutter.pricePerMinuteMinor + checked.estimate.sheetCount * material.sheets[0].priceMinor)
  })

  it('uses the process setting: a slower cut speed gives a longer cut time', async () => {
    const member = await signedIn('member@example.test')
    const plywood = await member.form('/api/analysis', svgForm(SQUARE_100_MM, await catalogIds('Heron', 'Birch plywood', 3)))
    const acrylic = await member.form('/api/analysis', svgForm(SQUARE_100_MM, await catalogIds('Heron', 'Cast acrylic', 3)))
    // Demo settings: plywood 1200 mm/min, acrylic 600 mm/min.
    expect(acrylic.body.time.cutS).toBeGreaterThan(plywood.body.time.cutS * 1.5)
  })

  it('refuses a material that may not go on the cutter, with the safety reason', async () => {
    const member = await signedIn('member@example.test')
    const response = await member.form('/api/analysis', svgForm(SQUARE_100_MM, await catalogIds('Heron', 'PVC foam board', 3)))
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(/chlorine/i)
  })

  it('says when a pair has no process setting', async () => {
    const staff = await signedIn('staff@example.test')
    const felt = await staff.post('/api/catalog/materials', { name: 'Wool felt', family: 'textile', thicknessMm: 3, sheets: [{ widthMm: 500, heightMm: 500, priceMinor: 0, currency: 'EUR' }] })
    const cutters = (await staff.get('/api/catalog/cutters')).body as { id: number; name: string }[]
    const response = await staff.form('/api/analysis', svgForm(SQUARE_100_MM, { cutterId: cutters.find((c) => c.name.startsWith('Heron'))!.id, materialId: felt.body.id }))
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(/not cuttable/)
  })

  it('needs a signed-in user', async () => {
    expect((await client().form('/api/analysis', svgForm(SQUARE_100_MM))).status).toBe(401)
  })

  it('answers 415 for a file that is not text, 422 for broken SVG, 400 without a file', async () => {
    const member = await signedIn('member@example.test')
    const png = new Blob([new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0xff, 0xfe, 0x00, 0x80])], { type: 'image/svg+xml' })
    const notText = await member.form('/api/analysis', svgForm(png, {}, 'renamed.svg'))
    expect(notText.status).toBe(415)
    expect(notText.body.message).toMatch(/not an SVG/)
    const notSvg = await member.form('/api/analysis', svgForm('<html><body>hello</body></html>'))
    expect(notSvg.status).toBe(415)
    const broken = await member.form('/api/analysis', svgForm('<svg xmlns="http://www.w3.org/2000/svg"><path d="M0 0 L10 10"'))
    expect(broken.status).toBe(422)
    const empty = new FormData()
    empty.set('cutterId', '1')
    expect((await member.form('/api/analysis', empty)).status).toBe(400)
  })

  it('refuses an XML entity bomb quickly and keeps serving', async () => {
    const member = await signedIn('member@example.test')
    const bomb = `<?xml version="1.0"?><!DOCTYPE svg [<!ENTITY a "aaaaaaaaaa"><!ENTITY b "&a;&a;&a;&a;&a;&a;&a;&a;&a;&a;"><!ENTITY c "&b;&b;&b;&b;&b;&b;&b;&b;&b;&b;">]><svg xmlns="http://www.w3.org/2000/svg"><text>&c;</text></svg>`
    const response = await member.form('/api/analysis', svgForm(bomb))
    expect(response.status).toBe(422)
    expect((await member.get('/api/me')).status).toBe(200)
  })

  it('answers 413 over the 20 MB limit without reading the file', async () => {
    const member = await signedIn('member@example.test')
    const huge = `<svg xmlns="http://www.w3.org/2000/svg">${' '.repeat(21 * 1024 * 1024)}</svg>`
    const response = await member.form('/api/analysis', svgForm(huge))
    expect(response.status).toBe(413)
    expect(response.body.message).toMatch(/20 MB/)
  })

  it('still answers a small request while a large file is being analysed', async () => {
    const member = await signedIn('member@example.test')
    const slits: string[] = []
    for (let row = 0; row < 150; row++) for (let col = 0; col < 150; col++) slits.push(`<path d="M${col * 4} ${row * 4}h3"/>`)
    const big = `<svg xmlns="http://www.w3.org/2000/svg" width="600mm" height="600mm" viewBox="0 0 600 600"><g stroke="#ff6a00" fill="none">${slits.join('')}</g></svg>`
    let bigDone = 0
    const bigRequest = member.form('/api/analysis', svgForm(big)).then((r) => {
      bigDone = performance.now()
      return r
    })
    await new Promise((r) => setTimeout(r, 50))
    const small = await member.get('/api/me')
    const smallDone = performance.now()
    const bigResponse = await bigRequest
    expect(small.status).toBe(200)
    expect(bigResponse.status).toBe(200)
    expect(bigResponse.body.cut.pierces).toBe(150 * 150)
    // The small request was not queued behind the analysis.
    expect(smallDone).toBeLessThan(bigDone)
  })
})
