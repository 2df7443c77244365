// The catalog's forms check their input with the route's own zod schema before sending, so the page
// shows the same field messages the server would, and a valid form really saves.
import { describe, expect } from 'vitest'
import { browserTest, checkAccessibility, screenshot, signInThroughForm } from './browser'

describe('catalog forms in the browser', () => {
  browserTest('a cutter with no bed size is refused on the page, with the field messages, and nothing is sent', async ({ browser }) => {
    const { page } = browser
    await signInThroughForm(browser, 'admin@example.test')
    await browser.open('/staff/setup/cutters')
    await page.getByRole('button', { name: 'Add a cutter' }).click()
    await page.getByLabel('Name').fill('Kestrel — bench laser')
    let posted = 0
    page.on('request', (request) => {
      if (request.method() === 'POST' && request.url().endsWith('/api/catalog/cutters')) posted++
    })
    await page.getByRole('button', { name: 'Save' }).click()
    await page.getByText('Bed width must be a number.', { exact: true }).waitFor()
    expect(await page.getByText('Bed height must be a number.', { exact: true }).count()).toBe(1)
    expect(posted).toBe(0)
    await checkAccessibility(page)
    await screenshot(page, 'cutter-form-errors')

    for (const [label, value] of [
      ['Bed width (mm)', '600'], ['Bed height (mm)', '400'], ['Thickest material (mm)', '6'], ['Price per machine minute (minor units, e.g. cents)', '70'],
      ['Top cutting speed (mm/min)', '20000'], ['Acceleration (mm/s²)', '2000'], ['Travel speed (mm/min)', '30000'],
    ]) await page.getByLabel(label!).fill(value!)
    await page.getByRole('button', { name: 'Save' }).click()
    await page.getByRole('cell', { name: 'Kestrel — bench laser' }).waitFor()
    expect(posted).toBe(1)
  })
})
