// A member who reads inches checks a cut file: the summary, the finding sentences and the preview's readout are in
// inches, converted from the engine's millimetres at 25.4 mm to the inch exactly (NIST Special Publication 811,
// appendix B.8). The drawing is sized so the expected readings are whole figures in inches.
import { describe, expect } from 'vitest'
import { client, DEMO_PASSWORD, laserPlywoodJob, linkToken, signedIn, uniqueEmail, waitForMail } from '../api/helpers'
import { svgDocument } from '../fixtures/svg'
import { browserTest, checkAccessibility, screenshot, signInThroughForm } from './browser'

const ENGRAVE = '#0a7d38'

/**
 * A 110 × 40 mm outline (300 mm of cut) with two 40 mm slits 1.724 mm apart: on the demo laser's 3 mm birch
 * (0.2 mm kerf, 3 mm minimum bridge) the web between them is 1.524 mm = 0.060 in, a bridge too narrow.
 * Beside them a filled square 25.4 mm on a side, engraved: 645.16 mm² = 1 in².
 */
function inchPanel(): string {
  const body = [
    '<rect x="5" y="5" width="110" height="40"/>',
    '<path d="M15 15H55"/>',
    '<path d="M15 16.724H55"/>',
    `<rect x="70" y="12" width="25.4" height="25.4" fill="${ENGRAVE}" stroke="${ENGRAVE}"/>`,
  ]
  return svgDocument(120, 50, body.join(''))
}

async function memberReadingInches(): Promise<string> {
  const email = uniqueEmail('inch-check')
  await client().post('/api/auth/sign-up', { name: 'Thaddeus Okonkwo-Reyes', email, password: DEMO_PASSWORD })
  expect((await client().post('/api/auth/verify', { token: linkToken(await waitForMail(email, /Confirm your e-mail/), '/verify') })).status).toBe(200)
  expect((await (await signedIn(email)).patch('/api/me/units', { lengthUnit: 'in' })).status).toBe(200)
  return email
}

describe('the check page in inches', () => {
  browserTest('a member who reads inches sees the summary, the finding sentences and the preview readout in inches', { timeout: 120_000 }, async ({ browser }) => {
    const email = await memberReadingInches()
    const { page } = browser
    await signInThroughForm(browser, email)
    await browser.open('/check')
    await page.getByLabel('Cutter').selectOption({ label: 'Heron — CO₂ laser' })
    // 3 mm / 25.4 mm per inch = 0.11811 in.
    await page.getByLabel('Material').selectOption({ label: 'Birch plywood 0.118 in' })
    await page.locator('input[type=file]').setInputFiles({ name: 'inch-panel.svg', mimeType: 'image/svg+xml', buffer: Buffer.from(inchPanel()) })
    await page.locator('[data-preview-state="ready"]').waitFor({ timeout: 60_000 })

    // The summary: 300 mm of outline and 80 mm of slits = 380 mm = 14.96 in; the engraved square is 1 in².
    const figure = (label: string) => page.locator('dl > div').filter({ has: page.locator('dt', { hasText: label }) }).locator('dd')
    expect(await figure('Cut length').textContent()).toBe('15.0 in')
    expect(await figure('Engrave area').textContent()).toBe('1 in²')

    // The group's sentence: the web 0.060 in against the 3 mm (0.118 in) minimum bridge.
    const findings = page.getByRole('region', { name: 'Findings' })
    const group = findings.getByRole('button', { name: /Bridge too narrow/ })
    await expect.poll(() => group.textContent()).toContain('1 bridge between cuts is 0.060 in wide after the kerf (limit 0.118 in)')
    expect(await findings.textContent()).not.toMatch(/\d mm\b/)

    // Chosen, the site is centred in the preview; the pointer on it reads the site in inches.
    await group.click()
    await expect.poll(() => page.locator('[data-site-announcer]').textContent()).toBe('Bridge too narrow, site 1 of 1: 0.060 in wide (limit 0.118 in)')
    await findings.getByText('site 1 of 1: 0.060 in wide (limit 0.118 in)', { exact: true }).waitFor()
    const canvas = (await page.locator('[data-preview] canvas').first().boundingBox())!
    await page.mouse.move(canvas.x + canvas.width / 2, canvas.y + canvas.height / 2)
    await expect.poll(() => page.getByRole('tooltip').textContent()).toMatch(/Bridge too narrow · 0\.060 in wide \(limit 0\.118 in\)\s*$/)
    await screenshot(page, 'check-in-inches')
    await checkAccessibility(page)
  })

  browserTest('the job page names the material, the sheet, the cut length and the warning group in inches', { timeout: 120_000 }, async ({ browser }) => {
    const email = await memberReadingInches()
    const member = await signedIn(email)
    const { jobId } = await laserPlywoodJob(member, 'Inch panel', inchPanel(), 'inch-panel.svg')
    const job = (await member.get(`/api/jobs/${jobId}`)).body as { sheet: { widthMm: number; heightMm: number } }

    const { page } = browser
    await signInThroughForm(browser, email)
    await browser.open(`/jobs/${jobId}`)
    const heading = page.locator('h1 + p')
    // 3 mm = 0.118 in; the sheet's sides at 25.4 mm to the inch, to the hundredth.
    const inches = (mm: number) => Number((mm / 25.4).toFixed(2))
    await expect.poll(() => heading.textContent()).toContain(`Birch plywood 0.118 in · sheet ${inches(job.sheet.widthMm)} × ${inches(job.sheet.heightMm)} in`)
    const figure = page.locator('dl > div').filter({ has: page.locator('dt', { hasText: /^Cut length$/ }) }).locator('dd')
    expect(await figure.textContent()).toBe('15.0 in')
    expect(await page.getByRole('cell', { name: '15.0 in' }).count()).toBeGreaterThan(0)
    // The warning group waiting for a reason, in inches too.
    await expect.poll(() => page.locator('main').textContent()).toContain('1 bridge between cuts is 0.060 in wide after the kerf (limit 0.118 in)')
    expect(await page.locator('main').textContent()).not.toMatch(/\d mm\b/)

    // The member's job list names the material's thickness in inches too.
    await browser.open('/jobs')
    await page.getByRole('cell', { name: 'Birch plywood 0.118 in' }).first().waitFor()
  })
})
