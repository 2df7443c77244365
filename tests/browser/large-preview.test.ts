// A large fold pattern in the job's preview: the canvas draws it fitted to the drawing, zooms, and the grouped
// finding list steps through a group's sites, each step moving the preview to the site and telling a
// screen reader which site it is. Speed is measured by a benchmark, not here.
import type { Page } from 'playwright-core'
import { describe, expect } from 'vitest'
import { formatCount } from '../../shared/finding-messages'
import { decodeSites } from '../../shared/packed-analysis'
import { laserPlywoodJob, signedIn } from '../api/helpers'
import { foldPanel, NARROW_PINCH_MM } from '../fixtures/fold-panel'
import { svgDocument } from '../fixtures/svg'
import { browserTest, checkAccessibility, screenshot, signInThroughForm } from './browser'

// Invented units, 5 mm square, filling the demo sheet's 590 × 390 mm inside its margin: 8 816 units, 26 449
// contours. Each unit has a fold line of two slits with a 0.6 mm hinge between them and to the next unit's
// slit, and a corner relief triangle pinched 0.8 mm from the fold line: on the demo laser's 3 mm birch plywood
// (3 mm minimum bridge, 0.2 mm kerf) every hinge and every pinch is too narrow.
const UNIT_MM = 5
const COLUMNS = 116
const ROWS = 76
const MARGIN_MM = 5

function largeFoldPattern(): string {
  const width = COLUMNS * UNIT_MM + 2 * MARGIN_MM
  const height = ROWS * UNIT_MM + 2 * MARGIN_MM
  const parts: string[] = [`<rect x="0" y="0" width="${width}" height="${height}"/>`]
  for (let row = 0; row < ROWS; row++) {
    for (let column = 0; column < COLUMNS; column++) {
      const x = MARGIN_MM + column * UNIT_MM
      const y = MARGIN_MM + row * UNIT_MM
      parts.push(`<path d="M${x + 0.3} ${y + 3}H${x + 2.2}"/>`, `<path d="M${x + 2.8} ${y + 3}H${x + 4.7}"/>`, `<path d="M${x + 0.4} ${y + 0.4}h1.6l-1.6 1.6z"/>`)
    }
  }
  return svgDocument(width, height, parts.join(''))
}

async function laserJobWithPattern(): Promise<{ jobId: number; fileId: number }> {
  return laserPlywoodJob(await signedIn('member@example.test'), 'Large pleated screen', largeFoldPattern(), 'pleated-screen.svg')
}

type View = [number, number, number, number]

async function previewState(page: Page) {
  return page.locator('[data-preview]').evaluate((element) => ({
    drawCount: Number(element.getAttribute('data-draw-count')),
    view: (element.getAttribute('data-view') ?? '').split(' ').map(Number) as View,
    selected: element.getAttribute('data-selected') ?? '',
    selectedAt: (element.getAttribute('data-selected-at') ?? '').split(' ').map(Number),
    highlighted: (element.getAttribute('data-highlighted') ?? '').split(' ').filter(Boolean).map(Number),
  }))
}

/** Runs `act` and waits until the preview has drawn again. */
async function andRedrawn(page: Page, act: () => Promise<unknown>) {
  const before = (await previewState(page)).drawCount
  await act()
  await expect.poll(async () => (await previewState(page)).drawCount, { timeout: 10_000 }).toBeGreaterThan(before)
  return previewState(page)
}

describe('the preview of a large fold pattern', () => {
  browserTest('opens fitted to the drawing, zooms, and steps through the sites of a finding group', { timeout: 240_000 }, async ({ browser }) => {
    const { jobId, fileId } = await laserJobWithPattern()
    const { page } = browser
    await signInThroughForm(browser, 'member@example.test')
    await browser.open(`/jobs/${jobId}`)
    await page.locator('[data-preview-state="ready"]').waitFor({ timeout: 60_000 })

    // Fitted to the drawing: all of it in view, and it fills the view in one direction (never a dot in a sheet).
    const drawingWidth = COLUMNS * UNIT_MM + 2 * MARGIN_MM
    const drawingHeight = ROWS * UNIT_MM + 2 * MARGIN_MM
    const fitted = await previewState(page)
    expect(fitted.view[0]).toBeLessThanOrEqual(0)
    expect(fitted.view[1]).toBeLessThanOrEqual(0)
    expect(fitted.view[0] + fitted.view[2]).toBeGreaterThanOrEqual(drawingWidth)
    expect(fitted.view[1] + fitted.view[3]).toBeGreaterThanOrEqual(drawingHeight)
    expect(Math.min(fitted.view[2] / drawingWidth, fitted.view[3] / drawingHeight)).toBeLessThan(1.2)
    await screenshot(page, 'large-preview-fitted')

    // The toolbar's zoom sits outside the drawing area; the keyboard zooms too, and 0 fits again.
    const zoomedIn = await andRedrawn(page, () => page.getByRole('button', { name: 'Zoom in' }).click())
    expect(zoomedIn.view[2]).toBeCloseTo(fitted.view[2] / 1.5, 3)
    const stage = page.getByRole('img', { name: /^Preview of the pattern/ })
    await stage.focus()
    const closer = await andRedrawn(page, () => page.keyboard.press('+'))
    expect(closer.view[2]).toBeCloseTo(zoomedIn.view[2] / 1.5, 3)
    const refitted = await andRedrawn(page, () => page.keyboard.press('0'))
    expect(refitted.view.map((v) => v.toFixed(2))).toEqual(fitted.view.map((v) => v.toFixed(2)))
    // The wheel zooms round the pointer: the drawing point under it stays put.
    // The drawing area is the canvas inside the stage's border.
    const canvas = page.locator('[data-preview] canvas').first()
    const box = (await canvas.boundingBox())!
    await page.mouse.move(box.x + box.width * 0.3, box.y + box.height * 0.4)
    const wheeled = await andRedrawn(page, () => page.mouse.wheel(0, -300))
    expect(wheeled.view[2]).toBeLessThan(fitted.view[2] / 1.5)
    // Within a pixel: the browser reports the pointer in whole pixels.
    const fittedPixelsPerMm = box.width / fitted.view[2]
    expect(Math.abs(wheeled.view[0] + 0.3 * wheeled.view[2] - (fitted.view[0] + 0.3 * fitted.view[2])) * fittedPixelsPerMm).toBeLessThan(1)
    expect(Math.abs(wheeled.view[1] + 0.4 * wheeled.view[3] - (fitted.view[1] + 0.4 * fitted.view[3])) * fittedPixelsPerMm).toBeLessThan(1)

    // One entry per group; choosing the narrow bridges selects their worst site, the next step the second.
    const group = page.getByRole('button', { name: /Bridge too narrow/ })
    expect(await group.count(), 'one entry for all narrow bridges').toBe(1)
    await expect.poll(() => group.textContent()).toMatch(/\d[\d\u00a0]{2,} bridges? between cuts/)
    const announcer = page.locator('[data-site-announcer]')
    expect(await announcer.getAttribute('aria-live')).toBe('polite')
    const first = await andRedrawn(page, () => group.click())
    expect(first.selected).toMatch(/^\d+:0$/)
    await expect.poll(() => announcer.textContent()).toMatch(/^Bridge too narrow, site 1 of [\d\u00a0]+: /)
    const groupIndex = Number(first.selected.split(':')[0])

    await page.getByRole('button', { name: 'Next site' }).focus()
    const second = await andRedrawn(page, () => page.keyboard.press('Enter'))
    expect(second.selected).toBe(`${groupIndex}:1`)
    await expect.poll(() => announcer.textContent()).toMatch(/^Bridge too narrow, site 2 of [\d\u00a0]+: /)
    expect(await page.getByRole('button', { name: 'Next site' }).evaluate((element) => element === document.activeElement), 'the focus stays on the step button').toBe(true)

    // The preview is centred on that site, as the packed site table places it, with its contours highlighted.
    const revision = (await (await page.request.get(`/api/jobs/${jobId}/files/${fileId}/revisions/1`)).json()) as { findingGroups: { code: string; firstSite: number }[] }
    const sites = decodeSites(await (await page.request.get(`/api/jobs/${jobId}/files/${fileId}/revisions/1/sites`)).body())
    const row = revision.findingGroups[groupIndex]!.firstSite + 1
    expect(revision.findingGroups[groupIndex]!.code).toBe('narrow-bridge')
    expect(second.selectedAt[0]).toBeCloseTo(sites.xy[2 * row]!, 2)
    expect(second.selectedAt[1]).toBeCloseTo(sites.xy[2 * row + 1]!, 2)
    expect(second.view[0] + second.view[2] / 2).toBeCloseTo(sites.xy[2 * row]!, 2)
    expect(second.view[1] + second.view[3] / 2).toBeCloseTo(sites.xy[2 * row + 1]!, 2)
    expect(second.highlighted).toEqual([sites.contourA[row], sites.contourB[row]].filter((c) => c! >= 0))
    await screenshot(page, 'large-preview-second-site')

    // Closer in (some 100 px to the mm), a site with no other near it is a single marker; a click on its ring selects it.
    await stage.focus()
    let close = second
    while (box.width / close.view[2] < 80) close = await andRedrawn(page, () => page.keyboard.press('+'))
    const pixelsPerMm = box.width / close.view[2]
    const onScreen = (r: number): [number, number] => [(sites.xy[2 * r]! - close.view[0]) * pixelsPerMm, (sites.xy[2 * r + 1]! - close.view[1]) * pixelsPerMm]
    const inView = Array.from({ length: sites.count }, (_, r) => r).filter((r) => {
      const [x, y] = onScreen(r)
      return x > 60 && y > 60 && x < box.width - 60 && y < box.height - 60
    })
    // No other site within 80 px (more than a grid cell and a marker's reach), and not the selected one.
    const apart = (a: number, b: number) => Math.hypot(onScreen(a)[0] - onScreen(b)[0], onScreen(a)[1] - onScreen(b)[1]) > 80
    const everySite = Array.from({ length: sites.count }, (_, r) => r)
    const lone = inView.find((r) => r !== row && everySite.every((other) => other === r || apart(r, other)))
    expect(lone, `a site standing alone among ${inView.length} in view`).toBeDefined()
    const loneGroup = revision.findingGroups.findIndex((g, i) => g.firstSite <= lone! && (revision.findingGroups[i + 1]?.firstSite ?? Infinity) > lone!)
    const [loneX, loneY] = onScreen(lone!)
    // Where the canvas is now: focusing the stage may have scrolled the page.
    const canvasNow = (await canvas.boundingBox())!
    const picked = await andRedrawn(page, () => page.mouse.click(canvasNow.x + loneX, canvasNow.y + loneY))
    expect(picked.selected).toBe(`${loneGroup}:${lone! - revision.findingGroups[loneGroup]!.firstSite}`)
    // A site picked on the preview is not zoomed to: the view stays where the member put it.
    expect(picked.view.map((v) => v.toFixed(3))).toEqual(close.view.map((v) => v.toFixed(3)))
    await expect.poll(() => announcer.textContent()).toContain(`site ${formatCount(lone! - revision.findingGroups[loneGroup]!.firstSite + 1)} of`)
    await screenshot(page, 'large-preview-picked-site')
    await checkAccessibility(page)
  })

  browserTest('on the check page, draws the packed preview that comes inline and points at the one narrow bridge', { timeout: 120_000 }, async ({ browser }) => {
    const { page } = browser
    await signInThroughForm(browser, 'member@example.test')
    await browser.open('/check')
    await page.getByLabel('Cutter').selectOption({ label: 'Heron — CO₂ laser' })
    await page.getByLabel('Material').selectOption({ label: 'Birch plywood 3 mm' })
    await page.locator('input[type=file]').setInputFiles({ name: 'lamp-panel.svg', mimeType: 'image/svg+xml', buffer: Buffer.from(foldPanel(NARROW_PINCH_MM)) })
    await page.locator('[data-preview-state="ready"]').waitFor({ timeout: 60_000 })
    const group = page.getByRole('button', { name: /Bridge too narrow/ })
    await expect.poll(() => group.textContent()).toMatch(/1 bridge between cuts/)
    const chosen = await andRedrawn(page, () => group.click())
    expect(chosen.selected).toMatch(/^\d+:0$/)
    // The pinched web is in the top-left corner, between the outline and the corner cut-out: both are highlighted.
    expect(chosen.selectedAt[0]).toBeLessThan(NARROW_PINCH_MM + 1)
    expect(chosen.selectedAt[1]).toBeLessThan(NARROW_PINCH_MM + 1)
    expect(chosen.highlighted).toHaveLength(2)
    expect(chosen.view[0] + chosen.view[2] / 2).toBeCloseTo(chosen.selectedAt[0]!, 2)
    await expect.poll(() => page.locator('[data-site-announcer]').textContent()).toMatch(/^Bridge too narrow, site 1 of 1: /)
    await checkAccessibility(page)
    await screenshot(page, 'check-preview-narrow-bridge')
  })
})
