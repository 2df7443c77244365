// The whole used-by story in a real browser, as the people in it click: a new member joins, gets a
// machine sign-off, uploads a fold pattern with one bridge too narrow, fixes it with a revision and
// submits; staff approve; the member books and pays on the card page; staff cut, charge and shelve
// the parts; the member collects them with the pickup code. The member and the staff each have their
// own browser, and neither may log a console error or a failed request the story does not provoke.
import type { Page } from 'playwright-core'
import { describe, expect, inject } from 'vitest'
import { linkToken, uniqueEmail, waitForMail } from '../api/helpers'
import { CARD_PAYS } from '../api/payment-helpers'
import { foldPanel, NARROW_PINCH_MM, SOUND_PINCH_MM } from '../fixtures/fold-panel'
import { formatMoney } from '../../utils/format'
import { browserTestWithStaff, checkAccessibility, expectVisibleFocus, screenshot, signInThroughForm, tabThrough } from './browser'

const LASER = 'Heron — CO₂ laser'
const MATERIAL = 'Birch plywood 3 mm'
const MEMBER_NAME = 'Tamsin Oyelaran-Brück'
const JOB_TITLE = 'Pleated lamp shade'
const PATTERN_FILE = 'lamp-panel.svg'
const SHELF = 'Shelf B, bin 7'

/** The member's browser and the staff's at the desk. */
const storyTest = browserTestWithStaff

function svgFile(name: string, svg: string) {
  return { name, mimeType: 'image/svg+xml', buffer: Buffer.from(svg) }
}

async function getJson<T>(page: Page, path: string): Promise<T> {
  const response = await page.request.get(path)
  expect(response.status(), `GET ${path}`).toBe(200)
  return (await response.json()) as T
}

/** What the preview shows, from the attributes it keeps for tests: the view box in mm, the selected site, its place and highlighted cuts. */
async function previewState(page: Page) {
  return page.locator('[data-preview]').evaluate((element) => ({
    view: (element.getAttribute('data-view') ?? '').split(' ').map(Number),
    selected: element.getAttribute('data-selected') ?? '',
    selectedAt: (element.getAttribute('data-selected-at') ?? '').split(' ').map(Number),
    highlighted: (element.getAttribute('data-highlighted') ?? '').split(' ').filter(Boolean),
  }))
}

interface CutterPrices {
  pricePerMinuteMinor: number
  setupMinutes: number
  billingIncrementMinutes: number
}
interface JobEstimateView {
  state: string
  cutter: { id: number }
  sheet: { priceMinor: number }
  estimate: { sheetCount: number; machineS: number }
}
interface PaymentView {
  bookingId: number
  jobTitle: string
  start: string
  state: string
  authorisedMinor: number
  capturedMinor: number
}

describe('the used-by story in the browser', () => {
  storyTest('a new member goes from joining to collecting cut parts, with staff at the desk', { timeout: 120_000 }, async ({ browser: member, staff }) => {
    const email = uniqueEmail('story')

    // 1 · Joining, confirming the e-mail, and the machine sign-off the booking rule asks for.
    await member.open('/sign-up')
    await member.page.getByLabel('Your name').fill(MEMBER_NAME)
    await member.page.getByLabel('E-mail').fill(email)
    await member.page.getByLabel('Password').fill('folded-birch-lantern')
    await member.page.getByRole('button', { name: 'Create my account' }).click()
    await member.page.getByText('Check your inbox').waitFor()
    const confirmation = await waitForMail(email, /Confirm your e-mail/)
    await member.open(`/verify?token=${linkToken(confirmation, '/verify')}`)
    await member.page.getByText('E-mail confirmed').waitFor()
    await expect.poll(() => member.page.getByRole('banner').textContent()).toContain(MEMBER_NAME)

    await signInThroughForm(staff, 'staff@example.test')
    await staff.open('/staff/sign-offs')
    await staff.page.getByRole('button', { name: 'Record a sign-off' }).click()
    await staff.page.getByLabel('Member').selectOption({ label: `${MEMBER_NAME} (${email})` })
    await staff.page.getByLabel('Cutter').selectOption({ label: LASER })
    await staff.page.getByRole('button', { name: 'Save' }).click()
    const signOffRow = staff.page.getByRole('row').filter({ hasText: MEMBER_NAME })
    await expect.poll(() => signOffRow.textContent()).toMatch(new RegExp(`${LASER}.*Valid`))
    await screenshot(staff.page, 'story-staff-sign-offs')

    // The check page, where anyone can try a file before starting a job.
    await member.open('/check')
    await checkAccessibility(member.page)
    await screenshot(member.page, 'story-check')

    // 2 · The job, the pattern with one pinched corner too narrow, the finding, and the revision that fixes it.
    await member.open('/jobs/new')
    await member.page.getByLabel('Title').fill(JOB_TITLE)
    await member.page.getByLabel('Cutter').selectOption({ label: LASER })
    await member.page.getByLabel('Material').selectOption({ label: MATERIAL })
    await member.page.getByRole('button', { name: 'Create the job and add files' }).click()
    await member.page.waitForURL(/\/jobs\/\d+$/)
    const jobId = Number(new URL(member.page.url()).pathname.split('/').pop())
    await member.page.getByRole('heading', { name: JOB_TITLE }).waitFor()

    // The keyboard reaches the file picker from the Files card, and its focus can be seen.
    await member.page.getByRole('heading', { name: 'Files', exact: true }).click()
    await tabThrough(member.page, 'Choose files', 5)
    // The input itself is visually hidden: what a sighted keyboard user sees is the ring on its button.
    const pickerRing = await member.page.locator('label', { hasText: 'Choose files' }).evaluate((label) => getComputedStyle(label).outlineStyle)
    expect(pickerRing, 'focus ring on the file picker button').not.toBe('none')
    await member.page.getByLabel('Choose files').setInputFiles(svgFile(PATTERN_FILE, foldPanel(NARROW_PINCH_MM)))
    const progress = member.page.getByRole('progressbar', { name: `${PATTERN_FILE} progress` })
    await expect.poll(() => progress.getAttribute('aria-valuenow')).toBe('100')
    await member.page.getByRole('listitem').filter({ hasText: PATTERN_FILE }).getByText('added').waitFor()

    const fileRow = member.page.getByRole('row').filter({ hasText: PATTERN_FILE })
    await fileRow.getByRole('button', { name: 'Preview' }).click()
    await member.page.getByRole('heading', { name: /revision 1\)$/ }).waitFor()
    await member.page.locator('[data-preview-state="ready"]').waitFor()
    const narrowFinding = member.page.getByRole('button', { name: /Bridge too narrow/ })
    await narrowFinding.waitFor()
    expect(await narrowFinding.count(), 'one group of narrow bridges in the first revision').toBe(1)
    await expect.poll(() => narrowFinding.textContent()).toMatch(/1 bridge between cuts/)

    const whole = await previewState(member.page)
    await narrowFinding.click()
    await expect.poll(async () => (await previewState(member.page)).selected).toMatch(/^\d+:0$/)
    await expect.poll(async () => (await previewState(member.page)).view[2]!, { message: 'the preview zooms in on the finding' }).toBeLessThan(whole.view[2]! / 2)
    const zoomed = await previewState(member.page)
    // The pinched web is in the top-left corner, between the outline and the corner cut-out.
    expect(zoomed.selectedAt[0]).toBeLessThan(NARROW_PINCH_MM + 1)
    expect(zoomed.selectedAt[1]).toBeLessThan(NARROW_PINCH_MM + 1)
    expect(zoomed.view[0]! + zoomed.view[2]! / 2).toBeCloseTo(zoomed.selectedAt[0]!, 2)
    expect(zoomed.view[1]! + zoomed.view[3]! / 2).toBeCloseTo(zoomed.selectedAt[1]!, 2)
    expect(zoomed.highlighted, 'both cuts on either side of the web are highlighted').toHaveLength(2)
    await expect.poll(() => member.page.locator('[data-site-announcer]').textContent()).toMatch(/^Bridge too narrow, site 1 of 1: /)
    await checkAccessibility(member.page)
    await screenshot(member.page, 'story-job-narrow-bridge')

    await fileRow.getByLabel(/^Upload a new revision of/).setInputFiles(svgFile(PATTERN_FILE, foldPanel(SOUND_PINCH_MM)))
    await member.page.getByRole('heading', { name: /revision 2\)$/ }).waitFor()
    await expect.poll(() => fileRow.textContent()).toMatch(/since 1: .*-1 findings/)
    await member.page.getByRole('button', { name: /Open line/ }).first().waitFor()
    expect(await member.page.getByRole('button', { name: /Bridge too narrow/ }).count(), 'the widened bridge is no longer reported').toBe(0)
    await expect.poll(() => member.page.getByRole('main').textContent()).toContain('0 to check')
    await screenshot(member.page, 'story-job-revision-2')
    await member.page.getByRole('button', { name: 'Submit for review' }).click()
    await member.page.getByText('Waiting for review').first().waitFor()

    // 3 · Staff approve from the review queue.
    await staff.open('/staff/review')
    await checkAccessibility(staff.page)
    await screenshot(staff.page, 'story-review-queue')
    await staff.page.getByRole('link', { name: JOB_TITLE }).click()
    await staff.page.waitForURL(`**/jobs/${jobId}`)
    await staff.page.getByRole('button', { name: 'Approve' }).click()
    await staff.page.getByText('Approved — ready to book').first().waitFor()

    // 4 · Booking a slot with the keyboard, paying on the card page, and the confirmation coming back.
    await member.open(`/jobs/${jobId}`)
    await member.page.getByRole('link', { name: 'Book a slot on the calendar' }).click()
    await member.page.waitForURL(`**/calendar?job=${jobId}`)
    const nextFree = member.page.getByRole('status').filter({ hasText: 'Next free' }).getByRole('button')
    await nextFree.first().waitFor()
    await member.page.locator('.fc-view').waitFor()
    await checkAccessibility(member.page)
    await screenshot(member.page, 'story-calendar')
    const firstSlot = (await nextFree.first().textContent())!.trim()
    await member.page.getByRole('heading', { name: 'Cutter calendar' }).click()
    await tabThrough(member.page, firstSlot, 10)
    await member.page.keyboard.press('Enter')
    const confirm = member.page.getByRole('dialog').filter({ hasText: 'Book this slot?' })
    await confirm.waitFor()
    expect(await confirm.textContent()).toContain(`${LASER}, ${firstSlot}`)
    await tabThrough(member.page, 'Book and pay', 3)
    await checkAccessibility(member.page)
    await screenshot(member.page, 'story-book-dialog')
    const checkoutOrigin = new URL(inject('stripeFakeUrl')).origin
    // The stand-in card page serves no icon; the browser asks for one anyway.
    member.expectFailedResponse(404, new RegExp(`^${checkoutOrigin.replaceAll('.', '\\.')}/favicon\\.ico$`))
    await member.page.keyboard.press('Enter')

    await member.page.waitForURL((url) => url.origin === checkoutOrigin)
    const payHeading = (await member.page.getByRole('heading', { level: 1 }).textContent())!.trim()
    // The booking holds the estimate on the card; the heading says it is a hold, not a payment.
    expect(payHeading).toMatch(/^Hold €\d+\.\d\d on your card$/)
    await checkAccessibility(member.page)
    await screenshot(member.page, 'story-checkout')
    await tabThrough(member.page, 'Card number', 10)
    await member.page.keyboard.type(CARD_PAYS)
    for (const [field, typed] of [['Expiry date', '12 / 34'], ['Security code', '123'], ['Name on card', MEMBER_NAME]] as const) {
      await member.page.keyboard.press('Tab')
      await expectVisibleFocus(member.page, field)
      await member.page.keyboard.type(typed)
    }
    await member.page.keyboard.press('Tab')
    await expectVisibleFocus(member.page, payHeading)
    expect(await member.page.getByLabel('Card number').inputValue()).toBe(CARD_PAYS)
    await member.page.keyboard.press('Enter')

    await member.page.waitForURL((url) => url.pathname === '/bookings')
    await member.page.getByText('Payment received').waitFor({ timeout: 20_000 })
    const bookingItem = member.page.getByRole('listitem').filter({ hasText: JOB_TITLE })
    await bookingItem.getByText('Held on card').waitFor()
    await checkAccessibility(member.page)
    await screenshot(member.page, 'story-bookings-paid')

    const payment = (await getJson<PaymentView[]>(member.page, '/api/me/payments')).find((p) => p.jobTitle === JOB_TITLE)!
    expect(payment.state).toBe('authorised')
    expect((await waitForMail(email, /Cutter booked/)).text).toContain(`${LASER} is yours on`)
    expect((await waitForMail(email, /Payment received/)).text).toContain(formatMoney(payment.authorisedMinor, 'EUR'))
    const calendarFile = await member.page.request.get((await bookingItem.getByRole('link', { name: 'Add to my calendar (.ics)' }).getAttribute('href'))!)
    expect(calendarFile.headers()['content-type']).toContain('text/calendar')
    const ics = await calendarFile.text()
    expect(ics).toContain('BEGIN:VEVENT')
    expect(ics).toContain(JOB_TITLE)

    // 5 · The cutting day: start, finish with fewer minutes than estimated, the capture, the shelf.
    const { timeZone } = await getJson<{ timeZone: string }>(staff.page, '/api/settings')
    const job = await getJson<JobEstimateView>(staff.page, `/api/jobs/${jobId}`)
    const cutter = await getJson<CutterPrices>(staff.page, `/api/catalog/cutters/${job.cutter.id}`)
    const bookedDay = new Intl.DateTimeFormat('en-CA', { timeZone }).format(new Date(payment.start))
    // The run sheet opens the booked day on the cutter booked that day; only when other test files have booked
    // another cutter more that day is the laser chosen by hand.
    await staff.open(`/staff/run-sheet?date=${bookedDay}`)
    const shownCutter = () => staff.page.getByLabel('Cutter').evaluate((select: HTMLSelectElement) => select.selectedOptions[0]?.textContent?.trim())
    if ((await shownCutter()) !== LASER) {
      const laserSheetLoaded = staff.page.waitForResponse((response) => response.url().includes('/api/run-sheet?') && response.url().includes(`cutter=${job.cutter.id}&`))
      await staff.page.getByLabel('Cutter').selectOption({ label: LASER })
      await laserSheetLoaded
    }
    await expect.poll(shownCutter).toBe(LASER)
    const entry = staff.page.locator('section').filter({ has: staff.page.getByRole('heading', { name: JOB_TITLE }) })
    await entry.getByRole('button', { name: 'Start cutting' }).waitFor()
    await checkAccessibility(staff.page)
    await screenshot(staff.page, 'story-run-sheet')
    await entry.getByRole('button', { name: 'Start cutting' }).click()

    // The estimate's machine time includes the setup, which is charged apart from the minutes cut.
    const estimatedCutMinutes = job.estimate.machineS / 60 - cutter.setupMinutes
    // A little under the estimate, so the hold on the card covers the charge.
    const actualMinutes = Math.max(0.1, Math.floor(estimatedCutMinutes * 7) / 10)
    expect(actualMinutes).toBeLessThan(estimatedCutMinutes)
    const billedMinutes = Math.ceil(actualMinutes / cutter.billingIncrementMinutes) * cutter.billingIncrementMinutes
    const expectedCharge = (billedMinutes + cutter.setupMinutes) * cutter.pricePerMinuteMinor + job.estimate.sheetCount * job.sheet.priceMinor
    // The field says the minutes are cutting time without setup; the confirmation shows the charge before the card is captured.
    await entry.getByLabel('Cutting minutes (without setup)').fill(String(actualMinutes))
    await entry.getByRole('button', { name: 'Finish and charge…' }).click()
    const finishDialog = staff.page.getByRole('dialog').filter({ hasText: 'Charge the member and finish?' })
    await finishDialog.waitFor()
    expect(await finishDialog.textContent()).toContain(`${cutter.setupMinutes} setup`)
    await screenshot(staff.page, 'story-finish-confirmation')
    await finishDialog.getByRole('button', { name: `Charge ${formatMoney(expectedCharge, 'EUR')}` }).click()
    await entry.getByText(`Cut in ${actualMinutes} min.`).waitFor()

    await expect
      .poll(async () => (await getJson<PaymentView[]>(member.page, '/api/me/payments')).find((p) => p.bookingId === payment.bookingId), { timeout: 10_000 })
      .toMatchObject({ state: 'captured', capturedMinor: expectedCharge })
    expect(expectedCharge).toBeLessThanOrEqual(payment.authorisedMinor)
    await member.open('/payments')
    const paymentCard = member.page.locator('section').filter({ hasText: JOB_TITLE })
    await paymentCard.getByText('Paid', { exact: true }).waitFor()
    expect(await paymentCard.textContent()).toContain(`charged ${formatMoney(expectedCharge, 'EUR')}`)

    await entry.getByLabel('Shelf or bin').fill(SHELF)
    await entry.getByRole('button', { name: 'Ready for pickup' }).click()
    await entry.getByText(`Waiting on the shelf: ${SHELF}.`).waitFor()

    // 6 · The pickup code on the member's job page, handed over once and refused the second time.
    await member.open(`/jobs/${jobId}`)
    const qr = member.page.getByRole('img', { name: /^QR code for pickup code/ })
    await qr.waitFor()
    const pickupCode = (await qr.getAttribute('aria-label'))!.split(' ').pop()!
    expect(pickupCode).toMatch(/^[A-Z0-9]{6}$/)
    expect(await qr.locator('svg').count(), 'the QR code is drawn').toBe(1)
    await member.page.getByText(`Ready to collect from ${SHELF}`).waitFor()
    expect(await member.page.getByRole('main').textContent()).toContain(pickupCode)
    expect((await waitForMail(email, new RegExp(`Ready to collect: ${JOB_TITLE}`))).text).toContain(pickupCode)
    await checkAccessibility(member.page)
    await screenshot(member.page, 'story-job-pickup-code')

    await staff.page.getByLabel('Pickup code').fill(pickupCode)
    await staff.page.getByRole('button', { name: 'Hand over' }).click()
    await staff.page.getByText(`Handed over: ${JOB_TITLE}.`).waitFor()
    await member.open(`/jobs/${jobId}`)
    await member.page.getByText('Collected', { exact: true }).first().waitFor()
    await screenshot(member.page, 'story-job-collected')

    staff.expectFailedResponse(409, /\/api\/pickups\/collect$/)
    await staff.page.getByLabel('Pickup code').fill(pickupCode)
    await staff.page.getByRole('button', { name: 'Hand over' }).click()
    await staff.page.getByText('This code was already used: the parts were collected.').waitFor()
    await screenshot(staff.page, 'story-run-sheet-code-used')
  })
})
