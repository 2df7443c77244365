// The page policy in a real browser: the built app hydrates and works under it with no CSP errors,
// while a script slipped into the page (as an uploaded drawing shown inline would carry) never runs.
import { describe, expect } from 'vitest'
import { browserTest, signInThroughForm } from './browser'

describe('content security policy in the browser', () => {
  browserTest('pages hydrate and run with no policy errors, signed out and signed in', async ({ browser }) => {
    await browser.open('/sign-in')
    await signInThroughForm(browser, 'member@example.test')
    for (const path of ['/', '/catalog', '/account']) await browser.open(path)
  })

  browserTest('an inline script injected into a page is refused and never runs', async ({ browser }) => {
    browser.expectConsoleError(/Content Security Policy/)
    await browser.open('/sign-in')
    const ran = await browser.page.evaluate(async () => {
      const injected = document.createElement('div')
      injected.innerHTML = '<svg xmlns="http://www.w3.org/2000/svg"><rect width="10" height="10"/></svg>'
      const script = document.createElement('script')
      script.textContent = 'window.__injectedRan = true'
      injected.append(script)
      document.body.append(injected)
      await new Promise((resolve) => setTimeout(resolve, 100))
      return (window as unknown as { __injectedRan?: boolean }).__injectedRan === true
    })
    expect(ran).toBe(false)
  })
})
