// The desk as people use it every day, in Chromium: a booking page opened from a bookmark works as one
// reached by a link, the calendar and the run sheet open on the right cutter, the booking dialog says
// when a slot is already inside the late-cancellation window, the calendar and the job's files fit a
// phone, and turning a job down or changing a role asks first.
import type { Page } from 'playwright-core'
import { beforeAll, describe, expect } from 'vitest'
import { client, linkToken, signedIn, uniqueEmail, waitForMail } from '../api/helpers'
import { plainPart, svgDocument } from '../fixtures/svg'
import { bookingBench, type BookingBench, type Client } from '../api/workshop-setup'
import { formatMoney } from '../../utils/format'
import { SAFETY_DEFERRAL } from '../../shared/safety'
import { browserTest, checkAccessibility, screenshot, signInThroughForm } from './browser'

let bench: BookingBench
let cutterName: string

beforeAll(async () => {
  bench = await bookingBench()
  // Last in the alphabet, so a page that opened on the first cutter would show another.
  cutterName = `Zephyr desk laser ${Date.now()}`
  expect((await bench.admin.patch(`/api/catalog/cutters/${bench.cutterId}`, { name: cutterName })).status).toBe(200)
})

/** The text of the option a labelled select shows. */
function shownOption(page: Page, label: string): Promise<string> {
  return page.getByLabel(label).evaluate((select: HTMLSelectElement) => select.selectedOptions[0]?.textContent?.trim() ?? '')
}

interface Plan {
  minutes: number
  slots: { start: string; late: boolean }[]
  currency: string
  cancellation: { freeHours: number; feePercent: number; lateFeeMinor: number }
}

interface QuietDay { offset: number; date: string }

/** Two days ahead (within the booking horizon, from the far end) on which no cutter has a booking, as offsets and local dates. */
async function twoQuietDays(): Promise<[QuietDay, QuietDay]> {
  const found: QuietDay[] = []
  for (let offset = 27; offset > 2 && found.length < 2; offset--) {
    const date = new Intl.DateTimeFormat('en-CA', { timeZone: bench.zone }).format(new Date(bench.at(offset, '12:00')))
    const { cutters } = (await bench.staff.get(`/api/run-sheet?date=${date}`)).body as { cutters: { bookings: number }[] }
    if (cutters.every((c) => c.bookings === 0)) found.push({ offset, date })
  }
  const [first, second] = found
  if (!first || !second) throw new Error(`Only ${found.length} quiet days in the booking horizon; the test needs two.`)
  return [first, second]
}

async function draftWithFile(owner: Client, title: string): Promise<number> {
  const job = await owner.post('/api/jobs', { title, cutterId: bench.cutterId, materialId: bench.materialId })
  const form = new FormData()
  form.set('file', new Blob([plainPart()], { type: 'image/svg+xml' }), 'bracket.svg')
  expect((await owner.form(`/api/jobs/${job.body.id}/files`, form)).status).toBe(201)
  return job.body.id
}

describe('the booking calendar opened by its address', () => {
  browserTest('a reload of /calendar?job=ID shows the job’s cutter, its length and slots, and books as by a link', { timeout: 90_000 }, async ({ browser }) => {
    const jobId = await bench.approvedJob('Bookmarked shelf brackets')
    const plan = (await bench.member.get(`/api/bookings/suggestions?jobId=${jobId}`)).body as Plan
    await signInThroughForm(browser, 'member@example.test')
    const { page } = browser
    // Opened straight from the address bar (rendered on the server), then reloaded: the same page both times.
    for (const open of [() => browser.open(`/calendar?job=${jobId}`), () => page.reload().then(() => page.getByText('Cutter calendar').waitFor())]) {
      await open()
      const box = page.locator('[data-booking-plan]')
      await box.waitFor()
      expect(await box.textContent()).toContain(`needs ${plan.minutes} min on ${cutterName}`)
      expect(await shownOption(page, 'Cutter')).toBe(cutterName)
      expect(await box.getByRole('button').count()).toBe(plan.slots.length)
    }

    // 4 · The first suggested slot: the dialog says plainly whether it is already inside the late window, and the fee.
    const first = plan.slots[0]!
    await page.locator('[data-booking-plan]').getByRole('button').first().click()
    const dialog = page.getByRole('dialog').filter({ hasText: 'Book this slot?' })
    await dialog.waitFor()
    const fee = formatMoney(plan.cancellation.lateFeeMinor, plan.currency)
    const terms = (await dialog.locator('[data-late-window]').textContent())!
    if (first.late) expect(terms).toMatch(new RegExp(`already inside the late-cancellation window: if you cancel it, ${plan.cancellation.feePercent} % of the estimate, .${fee.slice(1)} is charged`))
    else expect(terms).toContain('Free to cancel until')
    expect(first.late, 'a slot within the day is inside a window of 24 hours').toBe(Date.parse(first.start) - plan.cancellation.freeHours * 3_600_000 < Date.now())
    await dialog.getByRole('button', { name: 'Keep as it is' }).click()

    // A start picked on the calendar a week ahead is free to cancel until a day before it (the window is read from the settings).
    await page.getByRole('button', { name: 'Week' }).click()
    await page.getByRole('button', { name: 'Next ›' }).click()
    const column = page.locator('td.fc-timegrid-col[data-date]').last()
    const day = (await column.getAttribute('data-date'))!
    const lane = page.locator('td.fc-timegrid-slot-lane[data-time="10:00:00"]')
    await lane.scrollIntoViewIfNeeded()
    const [columnBox, laneBox] = [await column.boundingBox(), await lane.boundingBox()]
    await page.mouse.click(columnBox!.x + columnBox!.width / 2, laneBox!.y + laneBox!.height / 2)
    await dialog.waitFor()
    const later = (await dialog.locator('[data-late-window]').textContent())!
    const settings = (await bench.member.get('/api/settings')).body as { freeCancellationHours: number }
    const weekAhead = Date.parse(`${day}T10:00:00Z`) - settings.freeCancellationHours * 3_600_000 > Date.now() + 86_400_000
    if (weekAhead) expect(later).toMatch(new RegExp(`^Free to cancel until \\w+day \\d+ \\w+, \\d\\d:\\d\\d; after that, cancelling costs ${plan.cancellation.feePercent} % of the estimate`))
    await dialog.getByRole('button', { name: 'Keep as it is' }).click()

    // Another cutter chosen: the click says where the job is booked, as a note, never as "Done".
    await page.getByLabel('Cutter').selectOption({ index: 0 })
    await page.locator('[data-booking-plan]').getByText(`It is booked on ${cutterName}.`).waitFor()
    await page.locator('[data-booking-plan]').getByRole('button', { name: `Show ${cutterName}` }).click()
    expect(await shownOption(page, 'Cutter')).toBe(cutterName)
  })

  browserTest('without a job, the calendar opens on the cutter chosen last', async ({ browser }) => {
    // Staff book no jobs of their own, so no job's cutter comes first.
    await signInThroughForm(browser, 'staff@example.test')
    await browser.open('/calendar')
    await browser.page.getByLabel('Cutter').selectOption({ label: cutterName })
    await browser.open('/calendar')
    expect(await shownOption(browser.page, 'Cutter')).toBe(cutterName)
  })
})

describe('the run sheet’s cutter', () => {
  browserTest('a day opens on the cutter with bookings that day; an empty day on the cutter chosen last', async ({ browser }) => {
    // Two days nothing else is booked on (other test files book their own cutters on days of their own).
    const [bookedDay, emptyDay] = await twoQuietDays()
    const jobId = await bench.approvedJob('Run sheet bracket')
    expect((await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(bookedDay.offset, '11:00') })).status).toBe(201)
    await signInThroughForm(browser, 'staff@example.test')
    const { page } = browser
    await browser.open(`/staff/run-sheet?date=${bookedDay.date}`)
    expect(await shownOption(page, 'Cutter')).toBe(cutterName)
    await page.getByText(new RegExp(`^Booked that day: .*${cutterName} \\(1\\)`)).waitFor()
    await page.getByRole('heading', { name: 'Run sheet bracket' }).waitFor()
    expect(await page.locator('[data-estimate-minutes]').first().textContent()).toMatch(/Estimated [\d.]+ min of cutting/)

    // A day with nothing booked anywhere opens on the cutter chosen last time.
    await browser.open(`/staff/run-sheet?date=${emptyDay.date}`)
    await page.getByLabel('Cutter').selectOption({ label: cutterName })
    await browser.open(`/staff/run-sheet?date=${emptyDay.date}`)
    expect(await shownOption(page, 'Cutter')).toBe(cutterName)

    // ?cutter= (the overview's "Open its run sheet") opens that cutter, whatever was chosen last.
    const cutters = (await bench.staff.get('/api/catalog/cutters')).body as { id: number; name: string }[]
    const other = cutters.find((c) => c.name !== cutterName)!
    await browser.open(`/staff/run-sheet?date=${emptyDay.date}&cutter=${other.id}`)
    expect(await shownOption(page, 'Cutter')).toBe(other.name)
  })
})

describe('sign-offs, said when the job is started', () => {
  browserTest('the new-job form warns about a cutter without the member’s sign-off, and not about one with it', async ({ browser }) => {
    // The bench signs off the demo member on its cutter; the staff member holds no sign-off for it.
    await signInThroughForm(browser, 'staff@example.test')
    const { page } = browser
    await browser.open('/jobs/new')
    await page.getByLabel('Cutter').selectOption({ label: cutterName })
    const warning = page.locator('[data-sign-off-warning]')
    await warning.waitFor()
    expect(await warning.textContent()).toContain(`You don't hold a valid induction sign-off for ${cutterName}`)
    await page.getByRole('button', { name: 'Sign out', exact: true }).click()
    await signInThroughForm(browser, 'member@example.test')
    await browser.open('/jobs/new')
    await page.getByLabel('Cutter').selectOption({ label: cutterName })
    await page.getByLabel('Material').waitFor()
    expect(await warning.count()).toBe(0)
  })
})

describe('sign-offs, said on the job and at approval', () => {
  browserTest('a member without the cutter’s sign-off reads it on the job page; the staff read it beside Approve', async ({ browser }) => {
    const email = uniqueEmail('unsigned')
    const name = `Wilhelmina Osei-Drummond ${Date.now()}`
    await client().post('/api/auth/sign-up', { name, email, password: 'long-enough-pass' })
    await client().post('/api/auth/verify', { token: linkToken(await waitForMail(email, /Confirm your e-mail/), '/verify') })
    const member = await signedIn(email, 'long-enough-pass')
    const jobId = await draftWithFile(member, 'Unsigned coasters')
    expect((await member.post(`/api/jobs/${jobId}/submit`, {})).status).toBe(200)

    const { page } = browser
    await signInThroughForm(browser, email, 'long-enough-pass')
    await browser.open(`/jobs/${jobId}`)
    const warning = page.locator('[data-sign-off-warning]')
    expect(await warning.textContent()).toContain(`You don't hold a valid induction sign-off for ${cutterName}`)
    await page.getByRole('button', { name: 'Sign out', exact: true }).click()

    await signInThroughForm(browser, 'staff@example.test')
    await browser.open(`/jobs/${jobId}`)
    await page.getByRole('button', { name: 'Approve' }).waitFor()
    expect(await warning.textContent()).toContain(`${name} holds no valid induction sign-off for ${cutterName}`)
  })
})

describe('on a phone (390 × 844)', () => {
  browserTest('the calendar shows one day with controls that fit, and the job’s files are cards that keep their actions', { timeout: 60_000 }, async ({ browser }) => {
    const jobId = await bench.approvedJob('Phone booking')
    const draftId = await draftWithFile(bench.member, 'Phone draft')
    const { page } = browser
    await page.setViewportSize({ width: 390, height: 844 })
    await signInThroughForm(browser, 'member@example.test')
    await browser.open(`/calendar?job=${jobId}`)
    await page.locator('.fc-timeGridDay-view').waitFor()
    const overflow = () => page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)
    expect(await overflow(), 'nothing sticks out sideways').toBeLessThanOrEqual(0)
    await checkAccessibility(page)
    await screenshot(page, 'desk-phone-calendar')
    for (const name of ['‹ Previous', 'Today', 'Next ›', 'Day', 'Month']) {
      const box = (await page.getByRole('button', { name, exact: true }).boundingBox())!
      expect(box.x, `${name} starts on screen`).toBeGreaterThanOrEqual(0)
      expect(box.x + box.width, `${name} ends on screen`).toBeLessThanOrEqual(390)
    }
    // A day of the month opens that day, where a start can be picked.
    await page.getByRole('button', { name: 'Month', exact: true }).click()
    await page.locator('.fc-dayGridMonth-view').waitFor()
    // The day's number, away from any booking drawn in the cell.
    await page.locator('td.fc-daygrid-day:not(.fc-day-past):not(.fc-day-other) .fc-daygrid-day-top').last().click()
    await page.locator('.fc-timeGridDay-view').waitFor()

    await browser.open(`/jobs/${draftId}`)
    const table = page.locator('[data-file-table]')
    await table.getByText('bracket.svg').first().waitFor()
    expect(await page.locator('[data-file-table] thead').evaluate((head) => head.getBoundingClientRect().height)).toBeLessThanOrEqual(1)
    expect(await table.locator('tr').nth(1).evaluate((row) => getComputedStyle(row).display)).toBe('block')
    for (const name of [/^Preview /, /^Remove /]) {
      const box = (await table.getByRole('button', { name }).boundingBox())!
      expect(box.x + box.width).toBeLessThanOrEqual(390)
    }
    await table.getByText('Replace').waitFor()
    expect(await table.getByText('Cut length').isVisible(), 'each figure says what it is').toBe(true)
    expect(await overflow()).toBeLessThanOrEqual(0)
    await checkAccessibility(page)
    await screenshot(page, 'desk-phone-job')
  })
})

describe('confirming the irreversible', () => {
  browserTest('turning a job down asks first; the job stays submitted until the staff confirm', async ({ browser }) => {
    const jobId = await draftWithFile(bench.member, 'Job to turn down')
    expect((await bench.member.post(`/api/jobs/${jobId}/submit`, {})).status).toBe(200)
    await signInThroughForm(browser, 'staff@example.test')
    const { page } = browser
    await browser.open(`/jobs/${jobId}`)
    await page.getByText('Waiting for your review: approve it, ask the member for changes, or turn it down.').waitFor()
    await page.getByLabel('Comment to the member').fill('We do not cut brackets for load-bearing use.')
    await page.getByRole('button', { name: 'Turn down…' }).click()
    const dialog = page.getByRole('dialog').filter({ hasText: 'Turn this job down?' })
    await dialog.waitFor()
    expect((await bench.staff.get(`/api/jobs/${jobId}`)).body.state).toBe('submitted')
    await dialog.getByRole('button', { name: 'Keep as it is' }).click()
    expect((await bench.staff.get(`/api/jobs/${jobId}`)).body.state).toBe('submitted')
    await page.getByRole('button', { name: 'Turn down…' }).click()
    await dialog.getByRole('button', { name: 'Turn the job down' }).click()
    await expect.poll(async () => (await bench.staff.get(`/api/jobs/${jobId}`)).body.state).toBe('rejected')
    await page.getByText('Turned down. Nothing more happens to it.').waitFor()
  })

  browserTest('a role changes only once the admin confirms it; called off, the select shows the stored role again', async ({ browser }) => {
    const email = uniqueEmail('role-change')
    const name = `Ambrose Kettleworth ${Date.now()}`
    await client().post('/api/auth/sign-up', { name, email, password: 'long-enough-pass' })
    await client().post('/api/auth/verify', { token: linkToken(await waitForMail(email, /Confirm your e-mail/), '/verify') })
    const admin = await signedIn('admin@example.test')
    const roleOf = async () => ((await admin.get('/api/admin/users')).body as { email: string; role: string }[]).find((u) => u.email === email)!.role

    await signInThroughForm(browser, 'admin@example.test')
    const { page } = browser
    await browser.open('/admin/users')
    const select = page.getByLabel(`Role of ${name}`)
    await select.selectOption('staff')
    const dialog = page.getByRole('dialog').filter({ hasText: `Make ${name} staff?` })
    await dialog.waitFor()
    expect(await dialog.textContent()).toContain('review every job')
    await dialog.getByRole('button', { name: 'Keep as it is' }).click()
    await expect.poll(() => page.getByLabel(`Role of ${name}`).inputValue()).toBe('member')
    expect(await roleOf()).toBe('member')

    await page.getByLabel(`Role of ${name}`).selectOption('staff')
    await dialog.getByRole('button', { name: 'Change role' }).click()
    await expect.poll(roleOf).toBe('staff')
  })
})

describe('pages opened by their address', () => {
  browserTest('a job address that names no job is a plain 404, not a form error', async ({ browser }) => {
    await signInThroughForm(browser, 'member@example.test')
    browser.expectFailedResponse(404, /\/jobs\/abc$/)
    await browser.open('/jobs/abc', 404)
    const main = (await browser.page.getByRole('main').textContent())!
    expect(main).toContain('This page is not on the workshop floor')
    expect(main).not.toContain('Please check the form')
  })

  browserTest('staff at an admin address read that it is for admins; the stock page ends its warning with the safety sentence', async ({ browser }) => {
    await signInThroughForm(browser, 'staff@example.test')
    const { page } = browser
    browser.expectFailedResponse(403, /\/admin\/users$/)
    await browser.open('/admin/users', 403)
    expect(await page.getByRole('main').textContent()).toContain('This page is for admins.')
    await browser.open('/staff/setup/materials')
    expect(await page.getByRole('status').filter({ hasText: 'Never in a laser' }).textContent()).toContain(SAFETY_DEFERRAL)
    // Cutter kinds are said in words, never as their codes.
    expect(await page.getByRole('main').textContent()).not.toMatch(/co2-laser|fiber-laser/)
  })

  browserTest('member and staff pages load straight from the address bar without errors', { timeout: 60_000 }, async ({ browser }) => {
    const jobId = await bench.approvedJob('Opened directly')
    const submittedId = await draftWithFile(bench.member, 'Waiting for review')
    expect((await bench.member.post(`/api/jobs/${submittedId}/submit`, {})).status).toBe(200)
    await signInThroughForm(browser, 'member@example.test')
    for (const path of ['/jobs', `/jobs/${jobId}`, '/jobs/new', '/bookings', '/payments', `/calendar?job=${jobId}`]) {
      await browser.open(path)
      await browser.page.getByRole('main').waitFor()
    }
    // Each state says what happens next and who acts; a submitted job no longer asks for reasons.
    const nextStep = browser.page.locator('[data-next-step]')
    await browser.open(`/jobs/${jobId}`)
    expect(await nextStep.textContent()).toMatch(/^Your move\s*Approved\. Book a slot on the calendar/)
    await browser.open(`/jobs/${submittedId}`)
    expect(await nextStep.textContent()).toMatch(/^Waiting for the staff\s*The staff review your files next/)
    expect(await browser.page.getByRole('main').textContent()).not.toMatch(/Ready once|Ready to submit/)
    await browser.page.getByRole('button', { name: 'Withdraw this job' }).waitFor()
    await browser.page.getByRole('button', { name: 'Sign out', exact: true }).click()
    await signInThroughForm(browser, 'staff@example.test')
    for (const path of ['/staff/review', '/staff/run-sheet', `/jobs/${jobId}`, '/calendar']) {
      await browser.open(path)
      await browser.page.getByRole('main').waitFor()
    }
    expect(await browser.page.getByRole('main').textContent()).not.toContain('another cutter')
  })
})

describe('the preview’s “Whole sheet”', () => {
  browserTest('shows the stock sheet, not the drawing, when the drawing is larger than the sheet', async ({ browser }) => {
    await signInThroughForm(browser, 'member@example.test')
    const { page } = browser
    await browser.open('/check')
    const materialId = Number(await page.getByLabel('Material').inputValue())
    const materials = (await (await page.request.get('/api/catalog/materials')).json()) as { id: number; sheets: { widthMm: number; heightMm: number }[] }[]
    const sheet = materials.find((m) => m.id === materialId)!.sheets[0]!
    const side = 2 * Math.max(sheet.widthMm, sheet.heightMm)
    await page.locator('input[type=file]').setInputFiles({ name: 'oversize.svg', mimeType: 'image/svg+xml', buffer: Buffer.from(svgDocument(side, side, `<rect x="5" y="5" width="${side - 10}" height="${side - 10}"/>`)) })
    await page.locator('[data-preview-state="ready"]').waitFor()
    const view = async () => ((await page.locator('[data-preview]').getAttribute('data-view')) ?? '').split(' ').map(Number) as [number, number, number, number]
    const fitted = await view()
    await page.getByRole('button', { name: 'Whole sheet' }).click()
    await expect.poll(async () => (await view())[2]).toBeLessThan(fitted[2])
    const [x, y, width, height] = await view()
    expect(x + width / 2).toBeCloseTo(sheet.widthMm / 2, 0)
    expect(y + height / 2).toBeCloseTo(sheet.heightMm / 2, 0)
    expect(width).toBeGreaterThanOrEqual(sheet.widthMm)
    expect(height).toBeGreaterThanOrEqual(sheet.heightMm)
  })
})
