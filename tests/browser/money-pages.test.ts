// The money pages as people use them: a member with a balance to pay, staff finishing a cut through the charge's
// confirmation, and staff handing over parts while money is still owed. Amounts read as money, never as minor units
// or codes.
import { beforeAll, describe, expect } from 'vitest'
import { waitForPaymentState, payCheckout } from '../api/payment-helpers'
import { bookingBench, type BookingBench } from '../api/workshop-setup'
import { browserTest, checkAccessibility, screenshot, signInThroughForm } from './browser'

let bench: BookingBench
let owing: { jobId: number; bookingId: number; title: string; code: string; balanceMinor: number; chargeMinor: number }
let onMachine: { jobId: number; title: string }
let day: string

// Titles unique to this run, in letters only, so no number in them passes for an amount.
const tag = () => Date.now().toString(36).replace(/\d/g, (d) => 'abcdefghij'[Number(d)]!) + Math.random().toString(36).slice(2, 6).replace(/\d/g, '')
const euros = (minor: number) => `€${(minor / 100).toFixed(2)}`
/** Fails if any of the amounts shows as a bare count of minor units ("8690") instead of money ("€86.90"). */
function expectNoRawMinorUnits(text: string, ...amountsMinor: number[]) {
  for (const amount of amountsMinor) expect(text).not.toMatch(new RegExp(`(?<![\\d.,])${amount}(?![\\d.,])`))
}

async function paidAndStarted(title: string, clock: string) {
  const jobId = await bench.approvedJob(title)
  const booking = (await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(1, clock) })).body
  await payCheckout(booking.checkoutUrl)
  await waitForPaymentState(bench.member, booking.id, 'authorised')
  expect((await bench.staff.post(`/api/jobs/${jobId}/start`)).status).toBe(200)
  return { jobId, bookingId: booking.id as number }
}

beforeAll(async () => {
  bench = await bookingBench()
  day = bench.at(1, '12:00').slice(0, 10)
  const title = `Long lampshade ${tag()}`
  const cut = await paidAndStarted(title, '09:00')
  const finished = (await bench.staff.post(`/api/jobs/${cut.jobId}/finish`, { actualMinutes: 90 })).body
  expect(finished.balanceMinor).toBeGreaterThan(0)
  await bench.staff.post(`/api/jobs/${cut.jobId}/ready`, { location: 'Shelf B' })
  const code = (await bench.member.get(`/api/jobs/${cut.jobId}/pickup`)).body.code
  owing = { ...cut, title, code, balanceMinor: finished.balanceMinor, chargeMinor: finished.chargeMinor }
  const machineTitle = `Coaster set ${tag()}`
  onMachine = { jobId: (await paidAndStarted(machineTitle, '11:00')).jobId, title: machineTitle }
  expect((await bench.staff.post(`/api/jobs/${onMachine.jobId}/problems`, { kind: 're-cut', note: 'Second pass on the rim' })).status).toBe(201)
})

describe('money pages in the browser', () => {
  browserTest('a member sees what is still owed as money, on My payments and on the job, with a button to pay it', async ({ browser }) => {
    const { page } = browser
    await signInThroughForm(browser, 'member@example.test')
    await browser.open('/payments')
    // Balances owed come first, under To pay, whatever page of payments their booking is on.
    const card = page.getByRole('region', { name: 'To pay' }).getByRole('listitem').filter({ hasText: owing.title })
    await card.getByText(`${euros(owing.balanceMinor)} is still to pay`).waitFor()
    await card.getByRole('button', { name: `Pay ${euros(owing.balanceMinor)}` }).waitFor()
    expectNoRawMinorUnits(await card.innerText(), owing.balanceMinor, owing.chargeMinor, owing.chargeMinor - owing.balanceMinor)
    await checkAccessibility(page)
    await screenshot(page, 'money-my-payments-balance')

    await browser.open(`/jobs/${owing.jobId}`)
    await page.getByText(`${euros(owing.balanceMinor)} is still owed`).waitFor()
    // What happens next says so too, and that the parts wait at the desk: not "nothing to do".
    const next = page.locator('section').filter({ has: page.getByRole('heading', { name: 'What happens next' }) })
    await next.getByText(`Pay the ${euros(owing.balanceMinor)} still owed under My payments.`).waitFor()
    await next.getByText('Collect your parts at the desk').waitFor()
    expect(await next.getByText('Nothing for you to do').count()).toBe(0)
    await screenshot(page, 'money-job-balance')
  })

  browserTest('staff finish a cut through the charge’s confirmation, and confirm a hand-over while money is owed', async ({ browser }) => {
    const { page } = browser
    await signInThroughForm(browser, 'staff@example.test')
    await browser.open('/staff/run-sheet')
    await page.getByLabel('Cutter').selectOption({ label: (await bench.staff.get(`/api/catalog/cutters/${bench.cutterId}`)).body.name })
    await page.getByLabel('Day').fill(day)
    const machine = page.locator('div').filter({ has: page.getByRole('heading', { name: onMachine.title }) }).filter({ has: page.getByRole('button', { name: 'Finish and charge…' }) }).last()
    await machine.waitFor()
    // A problem reads in words, not as its code.
    await machine.getByText('✕ Re-cut needed: Second pass on the rim').waitFor()
    const owingEntry = page.locator('div').filter({ has: page.getByRole('heading', { name: owing.title }) }).filter({ hasText: 'still owes' }).last()
    await owingEntry.getByText(`still owes ${euros(owing.balanceMinor)}`).waitFor()
    await screenshot(page, 'money-run-sheet')

    await machine.getByLabel('Cutting minutes (without setup)').fill('3')
    await machine.getByRole('button', { name: 'Finish and charge…' }).click()
    const dialog = page.getByRole('dialog')
    await dialog.getByText('Charge the member and finish?').waitFor()
    const quote = (await bench.staff.get(`/api/jobs/${onMachine.jobId}/finish-quote?actualMinutes=3`)).body
    expectNoRawMinorUnits(await dialog.innerText(), quote.chargeMinor, quote.estimateMinor)
    await dialog.getByText(euros(quote.chargeMinor)).first().waitFor()
    // The estimate's minutes include the setup, as the billed minutes do, so the two compare.
    await dialog.getByText(`${quote.estimateMinutes} min billed, of which ${quote.setupMinutes} setup: ${euros(quote.estimateMinor)}`).waitFor()
    await screenshot(page, 'money-finish-confirmation')
    await dialog.getByRole('button', { name: /^Charge €/ }).click()
    await page.getByRole('dialog').waitFor({ state: 'detached' })

    browser.expectFailedResponse(409, /\/api\/pickups\/collect$/)
    await page.getByLabel('Pickup code').fill(owing.code)
    await page.getByRole('button', { name: 'Hand over' }).click()
    const owed = page.getByRole('dialog')
    await owed.getByText('A balance is still owed').waitFor()
    await owed.getByText(`The member still owes ${euros(owing.balanceMinor)} for "${owing.title}".`).waitFor()
    await screenshot(page, 'money-hand-over-owed')
    await owed.getByRole('button', { name: 'Hand over anyway' }).click()
    await page.getByText(`Handed over: ${owing.title}.`).waitFor()
  })

  browserTest('an admin reads every payment’s state in words', async ({ browser }) => {
    const { page } = browser
    await signInThroughForm(browser, 'admin@example.test')
    await browser.open('/admin/payments')
    const row = page.getByRole('row').filter({ hasText: owing.title })
    await row.getByText('Balance to pay').waitFor()
    expect(await page.getByRole('table').innerText()).not.toMatch(/\b(?:balance-due|partly-refunded|authorised|captured|awaiting)\b/)
    await page.getByLabel('State').selectOption({ label: 'Balance to pay' })
    await page.getByRole('row').filter({ hasText: onMachine.title }).waitFor({ state: 'detached' })
    await row.waitFor()
  })
})
