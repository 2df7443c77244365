// The overview each role lands on, and a cutter going out of service as staff and a member see it, in a real browser.
import { DateTime } from 'luxon'
import { describe, expect, inject } from 'vitest'
import { client, DEMO_PASSWORD, linkToken, uniqueEmail, waitForMail } from '../api/helpers'
import { payCheckout, waitForPaymentState } from '../api/payment-helpers'
import { bookingBench } from '../api/workshop-setup'
import { browserTest, browserTestWithStaff, checkAccessibility, screenshot, signInThroughForm } from './browser'

describe('the overview per role in the browser', () => {
  browserTest('a member sees open jobs with what each waits for; staff and admin see the desk', async ({ browser }) => {
    const bench = await bookingBench()
    const title = `Overview bracket ${Date.now()}`
    await bench.approvedJob(title)
    const cutterName = (await bench.staff.get(`/api/catalog/cutters/${bench.cutterId}`)).body.name as string
    const { page } = browser

    await signInThroughForm(browser, 'member@example.test')
    await browser.open('/')
    await page.getByRole('heading', { name: 'Hello, Juno' }).waitFor()
    const jobRow = page.getByRole('listitem').filter({ hasText: title })
    await expect.poll(() => jobRow.textContent()).toMatch(/Waiting for you:\s*Book a time on Bench laser/)
    expect(await jobRow.getByRole('link', { name: 'Book a time' }).getAttribute('href')).toMatch(/^\/calendar\?job=\d+$/)
    for (const card of ['Next booking', 'Ready to collect', 'Balance owed', 'Your open jobs']) await page.getByRole('heading', { name: card }).waitFor()
    await checkAccessibility(page)
    await screenshot(page, 'home-member')

    // Phone width: the cards stack and nothing runs off the side.
    await page.setViewportSize({ width: 390, height: 844 })
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390)
    await screenshot(page, 'home-member-phone')
    await page.setViewportSize({ width: 1280, height: 800 })

    await page.getByRole('button', { name: 'Sign out', exact: true }).click()
    await page.waitForURL('**/sign-in')
    await signInThroughForm(browser, 'staff@example.test')
    await browser.open('/')
    for (const card of ['Cutters out of service', 'Review queue', 'Waiting for pickup', /^Today's run sheet/]) await page.getByRole('heading', { name: card }).waitFor()
    const today = page.getByRole('region', { name: `Today on ${cutterName}` })
    await today.getByText('Nothing booked today.').waitFor()
    expect(await today.textContent()).not.toContain('Out of service')
    // Down from now: its card says so.
    expect((await bench.staff.post('/api/outages', { cutterId: bench.cutterId, reason: 'Fume extractor fan seized', expectedBackAt: bench.at(1, '12:00') })).status).toBe(201)
    await browser.open('/')
    await expect.poll(() => today.textContent()).toMatch(/Out of service until about .*: Fume extractor fan seized/)
    expect(await page.getByRole('heading', { name: /^This week/ }).count(), 'the week is the admin’s').toBe(0)
    await checkAccessibility(page)
    await screenshot(page, 'home-staff')

    await page.getByRole('button', { name: 'Sign out', exact: true }).click()
    await page.waitForURL('**/sign-in')
    await signInThroughForm(browser, 'admin@example.test')
    await browser.open('/')
    await page.getByRole('heading', { name: /^This week/ }).waitFor()
    await page.getByRole('table', { name: 'Utilisation per cutter this week' }).getByRole('rowheader', { name: cutterName }).waitFor()
    await checkAccessibility(page)
    await screenshot(page, 'home-admin')
  })

  browserTestWithStaff('staff mark a cutter out of service; the member finds the booking called off and books a new time', { timeout: 90_000 }, async ({ browser: member, staff }) => {
    const bench = await bookingBench()
    const cutterName = (await bench.staff.get(`/api/catalog/cutters/${bench.cutterId}`)).body.name as string
    const title = `Fence brackets ${Date.now()}`
    const jobId = await bench.approvedJob(title)
    const booked = await bench.member.post('/api/bookings', { jobId, cutterId: bench.cutterId, start: bench.at(5, '09:00') })
    expect(booked.status).toBe(201)
    await payCheckout(booked.body.checkoutUrl)
    await waitForPaymentState(bench.member, booked.body.id, 'authorised')
    const local = (days: number, clock: string) => DateTime.fromISO(bench.at(days, clock)).setZone(bench.zone).toFormat("yyyy-MM-dd'T'HH:mm")

    await signInThroughForm(staff, 'staff@example.test')
    await staff.open('/')
    const { page } = staff
    await page.getByRole('button', { name: 'Mark a cutter out of service…' }).click()
    await page.getByRole('combobox', { name: /^Cutter/ }).selectOption({ label: cutterName })
    await page.getByLabel('Reason').fill('Mirror mount cracked')
    await page.getByLabel('Out of service from').fill(local(5, '08:00'))
    await page.getByLabel('Expected back').fill(local(6, '20:00'))
    await page.getByRole('button', { name: 'Mark out of service' }).click()
    const dialog = page.getByRole('dialog')
    await dialog.getByText('Every booking on').waitFor()
    await checkAccessibility(page)
    await dialog.getByRole('button', { name: 'Mark out of service and tell the members' }).click()
    const done = page.getByRole('status').filter({ hasText: 'Marked out of service' })
    await expect.poll(() => done.textContent()).toMatch(new RegExp(`Juno Castellane · ${title} · .* · hold released`))
    const outage = page.getByRole('listitem').filter({ hasText: `${cutterName}: Mirror mount cracked` })
    await outage.getByText('1 booking called off').waitFor()
    await screenshot(page, 'home-staff-outage')

    // The repair goes faster than thought: an earlier return, then back in service before the period began.
    await outage.getByRole('button', { name: 'Change expected return' }).click()
    await page.getByLabel('New expected return').fill(local(5, '12:00'))
    await page.getByRole('dialog').getByRole('button', { name: 'Save the expected return' }).click()
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'Expected return changed' }).textContent()).toContain('No bookings fell in the period.')
    await expect.poll(() => outage.textContent()).toMatch(/back about .*, 12:00/)
    await outage.getByRole('button', { name: 'Back in service' }).click()
    await page.getByRole('dialog').getByRole('button', { name: 'Back in service' }).click()
    await outage.waitFor({ state: 'detached' })

    await signInThroughForm(member, 'member@example.test')
    await member.open('/')
    const notice = member.page.getByRole('status').filter({ hasText: `${cutterName} is out of service: your booking is called off` })
    await expect.poll(() => notice.textContent()).toContain('Mirror mount cracked')
    const offers = notice.getByRole('list', { name: `Free times for ${title}` }).getByRole('button')
    await offers.first().waitFor()
    await checkAccessibility(member.page)
    await screenshot(member.page, 'home-member-called-off')

    const checkoutOrigin = new URL(inject('stripeFakeUrl')).origin
    // The stand-in card page serves no icon; the browser asks for one anyway.
    member.expectFailedResponse(404, new RegExp(`^${checkoutOrigin.replaceAll('.', '\\.')}/favicon\\.ico$`))
    await offers.first().click()
    await member.page.waitForURL((url) => url.origin === checkoutOrigin)
    const job = (await bench.member.get(`/api/jobs/${jobId}`)).body
    expect(job.state).toBe('booked')
  })

  browserTest('a member chooses inches on the account page and reads lengths in inches', async ({ browser }) => {
    const email = uniqueEmail('inches')
    await client().post('/api/auth/sign-up', { name: 'Hollis Varga', email, password: DEMO_PASSWORD })
    expect((await client().post('/api/auth/verify', { token: linkToken(await waitForMail(email, /Confirm your e-mail/), '/verify') })).status).toBe(200)
    const { page } = browser
    await signInThroughForm(browser, email)
    await browser.open('/catalog')
    const main = page.getByRole('main')
    await expect.poll(() => main.textContent()).toMatch(/Birch plywood.*\b3 mm/)
    expect(await main.textContent()).not.toMatch(/\d in\b/)

    await browser.open('/account')
    await page.getByLabel('Show lengths and areas in').selectOption({ label: 'Inches (in)' })
    await page.getByRole('button', { name: 'Save units' }).click()
    // 3 mm ÷ 25.4 mm per inch (NIST SP 811, B.8) = 0.118 in.
    await page.getByText('Saved: a 3 mm sheet now reads 0.118 in.').waitFor()
    await checkAccessibility(page)

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'What can I cut' }).click()
    await page.waitForURL('**/catalog')
    await expect.poll(() => main.textContent()).toMatch(/Birch plywood.*0\.118 in/)
    // Opened by its address the page is drawn on the server, in the same unit.
    await browser.open('/catalog')
    await expect.poll(() => main.textContent()).toMatch(/Birch plywood.*0\.118 in/)
    await screenshot(page, 'catalog-in-inches')
  })
})
