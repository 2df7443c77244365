// The sign-in foundation as people use it, in a real browser: joining, confirming the e-mail,
// signing in and out, changing the password, the keyboard path, and what each role may see.
import type { Page } from 'playwright-core'
import { describe, expect, inject } from 'vitest'
import { DEMO_PASSWORD, linkToken, uniqueEmail, waitForMail } from '../api/helpers'
import type { Role } from '../../shared/roles'
import { NAV_ITEMS } from '../../utils/navigation'
import { browserTest, checkAccessibility, expectVisibleFocus, screenshot, signInThroughForm, signOutThroughHeader, submitSignInForm, tabThrough, waitForSignedIn } from './browser'

/** The navigation the layout should show to a role, from the one list of top-level pages. */
function navLabelsFor(role: Role): string[] {
  return NAV_ITEMS.filter((item) => item.roles.includes(role)).map((item) => item.label)
}

function mainNavLabels(page: Page): Promise<string[]> {
  return page
    .getByRole('navigation', { name: 'Main' })
    .getByRole('link')
    .allTextContents()
    .then((labels) => labels.map((label) => label.trim()))
}

describe('account journey in the browser', () => {
  browserTest('a visitor joins, confirms by the e-mailed link, signs in again and changes the password', async ({ browser }) => {
    const { page } = browser
    const email = uniqueEmail('browser-join')
    const firstPassword = 'first-sheet-of-steel'
    const newPassword = 'second-sheet-of-brass'

    await browser.open('/')
    await checkAccessibility(page)
    expect(await tabThrough(page)).toContain('Join the workshop')
    await screenshot(page, 'landing')

    await page.getByRole('main').getByRole('link', { name: 'Join the workshop' }).click()
    await page.getByRole('heading', { name: 'Join the workshop' }).waitFor()
    await checkAccessibility(page)
    await screenshot(page, 'sign-up')
    await page.getByLabel('Your name').fill('Marit Okonkwo-Lund')
    await page.getByLabel('E-mail').fill(email)
    await page.getByLabel('Password').fill(firstPassword)
    await page.getByRole('button', { name: 'Create my account' }).click()
    await expect.poll(() => page.getByRole('status').textContent()).toContain('Check your inbox')

    const mail = await waitForMail(email, /Confirm your e-mail/)
    await browser.open(`/verify?token=${linkToken(mail, '/verify')}`)
    await page.getByText('E-mail confirmed').waitFor()
    await expect.poll(() => page.getByRole('banner').textContent()).toContain('Marit Okonkwo-Lund')
    await screenshot(page, 'verified')

    await signOutThroughHeader(page)
    await checkAccessibility(page)
    await screenshot(page, 'sign-in')
    await signInThroughForm(browser, email, firstPassword)

    await page.getByRole('banner').getByRole('link', { name: 'Marit Okonkwo-Lund' }).click()
    await page.getByRole('heading', { name: 'Change password' }).waitFor()
    await expect.poll(() => page.getByRole('main').textContent()).toContain(email)
    await checkAccessibility(page)
    await screenshot(page, 'account')
    await page.getByLabel('Current password').fill(firstPassword)
    await page.getByLabel('New password').fill(newPassword)
    await page.getByRole('button', { name: 'Change password' }).click()
    await expect.poll(() => page.getByRole('status').textContent()).toContain('Password changed.')
    await waitForMail(email, /Your password was changed/)

    await signOutThroughHeader(page)
    await signInThroughForm(browser, email, newPassword)
    await expect.poll(() => page.getByRole('banner').textContent()).toContain('Marit Okonkwo-Lund')

    await page.getByRole('banner').getByRole('link', { name: 'Marit Okonkwo-Lund' }).click()
    await page.getByRole('button', { name: 'Sign out everywhere' }).click()
    const dialog = page.getByRole('dialog')
    await dialog.getByRole('button', { name: 'Sign out everywhere' }).click()
    await page.waitForURL('**/sign-in')
    await page.getByRole('heading', { name: 'Sign in' }).waitFor()
    browser.expectFailedResponse(401, /\/api\/me$/)
    expect(await page.evaluate(() => fetch('/api/me').then((r) => r.status))).toBe(401)
  })

  browserTest('a sign-in link whose next address leads off the site sends the member home, saying so', async ({ browser }) => {
    const { page } = browser
    await browser.open('/sign-in?next=//evil.example')
    await page.getByText('The link you followed pointed away from Kerfbook').waitFor()
    await page.getByLabel('E-mail').fill('member@example.test')
    await page.getByLabel('Password').fill(DEMO_PASSWORD)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await waitForSignedIn(page)
    expect(new URL(page.url()).pathname).toBe('/')
    expect(new URL(page.url()).host).toBe(new URL(inject('baseUrl')).host)
    expect(await page.getByRole('alert').count()).toBe(0)
  })

  browserTest('a sign-in link with a next address on the site goes there', async ({ browser }) => {
    const { page } = browser
    await browser.open('/sign-in?next=/jobs')
    expect(await page.getByText('pointed away from Kerfbook').count()).toBe(0)
    await page.getByLabel('E-mail').fill('member@example.test')
    await page.getByLabel('Password').fill(DEMO_PASSWORD)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL('**/jobs')
  })

  browserTest('a wrong password keeps the visitor on the sign-in page with the error shown', async ({ browser }) => {
    const { page } = browser
    browser.expectFailedResponse(401, /\/api\/auth\/sign-in$/)
    await submitSignInForm(browser, 'member@example.test', 'not-the-demo-password')
    await expect.poll(() => page.getByRole('alert').textContent()).toContain('E-mail or password is wrong.')
    expect(new URL(page.url()).pathname).toBe('/sign-in')
    expect(await page.getByRole('button', { name: 'Sign out' }).count()).toBe(0)
    await screenshot(page, 'sign-in-wrong-password')
  })

  browserTest('the keyboard alone reaches the sign-in fields with a visible focus and Enter signs in', async ({ browser }) => {
    const { page } = browser
    await browser.open('/sign-in')
    // The skip link and the header come first; the form must follow within a few steps.
    await tabThrough(page, 'E-mail', 8)
    await page.keyboard.type('member@example.test')
    await page.keyboard.press('Tab')
    await expectVisibleFocus(page, 'Password')
    await page.keyboard.type(DEMO_PASSWORD)
    await page.keyboard.press('Tab')
    await expectVisibleFocus(page, 'Sign in')
    await page.keyboard.press('Enter')
    await waitForSignedIn(page)
    expect(new URL(page.url()).pathname).toBe('/')
  })
})

describe('what each role sees in the browser', () => {
  browserTest.for([
    { role: 'staff', opens: 'Members', path: '/staff/members', shows: 'member@example.test' },
    { role: 'admin', opens: 'People & roles', path: '/admin/users', shows: 'staff@example.test' },
  ] as const)('$role sees the staff items and opens $opens', async ({ role, opens, path, shows }, { browser }) => {
    const { page } = browser
    await signInThroughForm(browser, `${role}@example.test`)
    const labels = await mainNavLabels(page)
    expect(labels).toEqual(navLabelsFor(role))
    expect(labels).toEqual(expect.arrayContaining(['Members']))
    expect(labels).not.toContain('Outbox')
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: opens }).click()
    await page.waitForURL(`**${path}`)
    await page.getByRole('cell', { name: shows }).waitFor()
    await checkAccessibility(page)
    await screenshot(page, path.slice(1).replace('/', '-'))
  })

  browserTest('a member sees no staff items and gets a friendly 403 page at a staff address', async ({ browser }) => {
    const { page } = browser
    await signInThroughForm(browser, 'member@example.test')
    const labels = await mainNavLabels(page)
    expect(labels).toEqual(navLabelsFor('member'))
    expect(labels).not.toContain('Members')
    expect(labels).not.toContain('Outbox')

    browser.expectFailedResponse(403, /\/staff\/members$/)
    await browser.open('/staff/members', 403)
    await page.getByRole('heading', { name: 'This page is not for your role' }).waitFor()
    expect(await page.getByRole('main').textContent()).toContain('This page is for workshop staff.')
    expect(await page.getByRole('cell', { name: 'staff@example.test' }).count()).toBe(0)
    await checkAccessibility(page)
    await screenshot(page, 'forbidden')
  })
})
