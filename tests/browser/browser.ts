// Real-browser test kit: Debian's Chromium driven by playwright-core against the shared test server.
// Each test gets a fresh browser profile; it fails on any console error or failed request it did not
// announce, and can check a page with axe-core.
import { mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { createRequire } from 'node:module'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import type * as Axe from 'axe-core'
import { chromium, type BrowserContext, type Page } from 'playwright-core'
import { expect, inject, test } from 'vitest'
import { DEMO_PASSWORD } from '../api/helpers'
import { CHROMIUM_MISSING, CHROMIUM_PATH, chromiumInstalled } from '../setup/chromium'

// No GPU here, and nothing may leave the machine: no updates, sync or background fetches.
const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
]
const SCREENSHOT_DIR = fileURLToPath(new URL('../artifacts/screenshots/', import.meta.url))
const AXE_SOURCE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8')
// WCAG 2.0, 2.1 and 2.2 at levels A and AA; colour contrast is part of wcag2aa.
const WCAG_AA_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa']

let addressCounter = 0

/** Something that went wrong in the page, as the browser reported it. */
interface BrowserProblem {
  kind: 'console error' | 'uncaught error' | 'request failed' | 'response'
  text: string
  url: string
  status?: number
}

/** A problem the test provokes on purpose, such as the 401 of a wrong password. */
interface ExpectedProblem {
  description: string
  matches: (problem: BrowserProblem) => boolean
  seen: boolean
}

export class BrowserSession {
  private readonly problems: BrowserProblem[] = []
  private readonly expectedProblems: ExpectedProblem[] = []
  private openingPage = false

  private constructor(
    readonly context: BrowserContext,
    readonly page: Page,
    private readonly profileDir: string,
  ) {
    context.on('console', (message) => {
      if (message.type() === 'error') this.report({ kind: 'console error', text: message.text(), url: message.location().url })
    })
    context.on('weberror', (error) => this.report({ kind: 'uncaught error', text: error.error().message, url: error.page()?.url() ?? '' }))
    context.on('requestfailed', (request) => {
      const errorText = request.failure()?.errorText ?? ''
      // Opening an address cancels what the page being left was still fetching (its prefetches): that
      // is the test navigating, not the app failing. The new page's own loads are covered by the
      // hydration wait in open(), which fails if they do not arrive.
      if (errorText === 'net::ERR_ABORTED' && this.openingPage) return
      this.report({ kind: 'request failed', text: `${request.method()} ${errorText}`, url: request.url() })
    })
    context.on('response', (response) => {
      if (response.status() >= 400) this.report({ kind: 'response', text: response.request().method(), url: response.url(), status: response.status() })
    })
  }

  private report(problem: BrowserProblem): void {
    const expected = this.expectedProblems.find((e) => e.matches(problem))
    if (expected) expected.seen = true
    else this.problems.push(problem)
  }

  static async launch(): Promise<BrowserSession> {
    // The global setup normally stops a run without Chromium before it gets here; this covers runs it let through.
    if (!chromiumInstalled()) throw new Error(CHROMIUM_MISSING)
    const profileDir = mkdtempSync(join(tmpdir(), 'kerfbook-chromium-'))
    const context = await chromium.launchPersistentContext(profileDir, {
      executablePath: CHROMIUM_PATH,
      headless: true,
      args: CHROMIUM_ARGS,
      baseURL: inject('baseUrl'),
      viewport: { width: 1280, height: 800 },
      // Every browser session would otherwise come from 127.0.0.1 and share one per-address sign-in
      // limit; the test server trusts this header, so each session appears from its own address.
      extraHTTPHeaders: { 'x-forwarded-for': `10.250.${Math.floor(Math.random() * 250)}.${++addressCounter % 250}` },
    })
    // Fail a missing element in seconds rather than at the 60 s test timeout.
    context.setDefaultTimeout(10_000)
    const page = context.pages()[0] ?? (await context.newPage())
    return new BrowserSession(context, page, profileDir)
  }

  /** Announces a failed response the test causes on purpose; the test fails if it never happens. */
  expectFailedResponse(status: number, url: RegExp): void {
    this.expectedProblems.push({
      description: `a ${status} response from ${url}`,
      // Chromium logs every 4xx/5xx response once more as a console error naming its status.
      matches: (p) => url.test(p.url) && (p.status === status || (p.kind === 'console error' && p.text.includes(`status of ${status}`))),
      seen: false,
    })
  }

  /** Announces a console error the test knows of; the test fails if it never happens, so it is noticed once fixed. */
  expectConsoleError(text: RegExp): void {
    this.expectedProblems.push({ description: `a console error matching ${text}`, matches: (p) => p.kind === 'console error' && text.test(p.text), seen: false })
  }

  /** Opens a path and waits until Nuxt has hydrated it, so clicks reach Vue rather than plain HTML. */
  async open(path: string, expectedStatus = 200): Promise<void> {
    this.openingPage = true
    try {
      const response = await this.page.goto(path)
      expect(response?.status(), `status of ${path}`).toBe(expectedStatus)
    } finally {
      this.openingPage = false
    }
    await waitForHydration(this.page)
  }

  unexpectedProblems(): string[] {
    const unexpected = this.problems.map((p) => `${p.kind}${p.status ? ` ${p.status}` : ''}: ${p.text} (${p.url || 'no address'})`)
    const neverSeen = this.expectedProblems.filter((e) => !e.seen).map((e) => `expected ${e.description}, which never came`)
    return [...unexpected, ...neverSeen]
  }

  async close(): Promise<void> {
    await this.context.close()
    rmSync(this.profileDir, { recursive: true, force: true })
  }
}

async function waitForHydration(page: Page): Promise<void> {
  await page.waitForFunction(() => {
    const app = (document.querySelector('#__nuxt') as { __vue_app__?: { $nuxt?: { isHydrating?: boolean } } } | null)?.__vue_app__
    return app?.$nuxt?.isHydrating === false
  })
}

/** A fixture with a fresh browser session that must end without unexpected console errors or failed requests. */
function checkedSession(which: string) {
  // The empty pattern is required: vitest reads a fixture's dependencies from its first parameter.
  return async ({}, use: (session: BrowserSession) => Promise<void>) => {
    const session = await BrowserSession.launch()
    try {
      await use(session)
      expect(session.unexpectedProblems(), `console errors or failed requests in ${which}`).toEqual([])
    } finally {
      await session.close()
    }
  }
}

/** A vitest test with a fresh `browser`, checked for problems when it ends. */
export const browserTest = test.extend<{ browser: BrowserSession }>({ browser: checkedSession('the browser') })

/** browserTest with a second browser, `staff`, for the people at the desk; it is checked for problems like the first. */
export const browserTestWithStaff = browserTest.extend<{ staff: BrowserSession }>({ staff: checkedSession('the staff browser') })

/** Saves a full-page screenshot as tests/artifacts/screenshots/<name>.png once the page is quiet. */
export async function screenshot(page: Page, name: string): Promise<void> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true })
  await page.waitForLoadState('networkidle')
  await page.screenshot({ path: join(SCREENSHOT_DIR, `${name}.png`), fullPage: true })
}

/** Runs axe-core on the page as it is now and fails with a readable list of WCAG 2.2 AA violations. */
export async function checkAccessibility(page: Page): Promise<void> {
  await page.waitForLoadState('networkidle')
  // Evaluated through the debugging protocol rather than a <script> tag, so a page's CSP cannot block it.
  await page.evaluate(AXE_SOURCE)
  const violations = await page.evaluate(async (tags) => {
    const axe = (window as unknown as { axe: typeof Axe }).axe
    const results = await axe.run(document, { runOnly: { type: 'tag', values: tags }, resultTypes: ['violations'] })
    return results.violations.map((violation) => ({
      id: violation.id,
      impact: violation.impact,
      help: violation.help,
      nodes: violation.nodes.map((node) => ({ target: node.target.join(' '), summary: node.failureSummary ?? '' })),
    }))
  }, WCAG_AA_TAGS)
  if (violations.length === 0) return
  const report = violations
    .map((v) => [`- ${v.id} (${v.impact}): ${v.help}`, ...v.nodes.map((n) => `    ${n.target}\n      ${n.summary.replaceAll('\n', '\n      ')}`)].join('\n'))
    .join('\n')
  throw new Error(`${violations.length} accessibility violation(s) on ${page.url()}:\n${report}`)
}

/** What a sighted keyboard user sees of the focused element: what it is called, and its outline. */
interface FocusStop {
  name: string
  outlineStyle: string
  outlineWidthPx: number
  /** Contrast of the outline against the background around the element (WCAG 1.4.11 asks for 3:1). */
  outlineContrast: number
}

function describeFocus(page: Page): Promise<FocusStop | null> {
  return page.evaluate(() => {
    const element = document.activeElement as HTMLElement | null
    if (!element || element === document.body) return null
    const channels = (css: string) => (css.match(/[\d.]+/g) ?? []).map(Number)
    const luminance = (css: string) => {
      const [r, g, b] = channels(css).map((c) => c / 255).map((c) => (c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4))
      return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!
    }
    const contrast = (a: string, b: string) => {
      const [light, dark] = [luminance(a), luminance(b)].sort((x, y) => y - x)
      return (light! + 0.05) / (dark! + 0.05)
    }
    // The outline sits outside the element, so what it must stand out from is the nearest painted
    // ancestor; for a gradient, every colour stop of it.
    let backgrounds: string[] = ['rgb(255, 255, 255)']
    for (let ancestor = element.parentElement; ancestor; ancestor = ancestor.parentElement) {
      const style = getComputedStyle(ancestor)
      const stops = style.backgroundImage.match(/rgba?\([^)]*\)/g)
      if (stops) backgrounds = stops
      else if ((channels(style.backgroundColor)[3] ?? 1) > 0) backgrounds = [style.backgroundColor]
      else continue
      break
    }
    const style = getComputedStyle(element)
    const label = (element as HTMLInputElement).labels?.[0]
    return {
      name: (label ? label.textContent?.replace('*', '') : element.getAttribute('aria-label') ?? element.textContent)?.trim() ?? '',
      outlineStyle: style.outlineStyle,
      outlineWidthPx: parseFloat(style.outlineWidth),
      outlineContrast: Math.min(...backgrounds.map((background) => contrast(style.outlineColor, background))),
    }
  })
}

function expectFocusShown(focus: FocusStop): void {
  expect(focus.outlineStyle, `outline of focused "${focus.name}"`).not.toBe('none')
  expect(focus.outlineWidthPx, `outline width of focused "${focus.name}"`).toBeGreaterThanOrEqual(1)
  expect(focus.outlineContrast, `outline contrast of focused "${focus.name}"`).toBeGreaterThanOrEqual(3)
}

/** Fails unless `name` has the keyboard focus and shows an outline that can be seen. */
export async function expectVisibleFocus(page: Page, name: string): Promise<void> {
  const focus = await describeFocus(page)
  expect(focus?.name, 'the focused element').toBe(name)
  expectFocusShown(focus!)
}

/**
 * Presses Tab until `until` has the focus, or without it until the focus leaves the page, and fails
 * on any stop on the way whose focus cannot be seen. Returns the names of the stops.
 */
export async function tabThrough(page: Page, until?: string, maxStops = 40): Promise<string[]> {
  const stops: string[] = []
  while (stops.length < maxStops) {
    await page.keyboard.press('Tab')
    const focus = await describeFocus(page)
    if (!focus) {
      if (until === undefined) return stops
      break
    }
    expectFocusShown(focus)
    stops.push(focus.name)
    if (focus.name === until) return stops
  }
  throw new Error(`Tab never reached ${until ? `"${until}"` : 'the end of the page'} within ${maxStops} stops: ${stops.join(' → ')}`)
}

/** Opens /sign-in, fills in the form as a person would and presses the button. */
export async function submitSignInForm(browser: BrowserSession, email: string, password: string): Promise<void> {
  await browser.open('/sign-in')
  const { page } = browser
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}

/** Signs in through the form and waits for the signed-in shell. */
export async function signInThroughForm(browser: BrowserSession, email: string, password = DEMO_PASSWORD): Promise<void> {
  await submitSignInForm(browser, email, password)
  await waitForSignedIn(browser.page)
}

/** Waits until the sign-in page has sent the user on; the session store is set before that navigation ends. */
export async function waitForSignedIn(page: Page): Promise<void> {
  await page.waitForURL((url) => url.pathname !== '/sign-in')
  await page.getByRole('button', { name: 'Sign out', exact: true }).waitFor()
}

/** Signs out with the header button and waits for the sign-in page. */
export async function signOutThroughHeader(page: Page): Promise<void> {
  await page.getByRole('button', { name: 'Sign out', exact: true }).click()
  await page.waitForURL('**/sign-in')
  await page.getByRole('heading', { name: 'Sign in' }).waitFor()
}
