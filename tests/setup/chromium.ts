// The browser tests drive Debian's Chromium. Without it, each browser test would die with a launch error deep in
// playwright-core, after the build and the API tests; instead the app project's global setup (tests/setup/server.ts)
// stops the run at once with one line saying how to get it. `npm test` does not install system packages itself:
// that takes root and the network and changes the machine, which a test command should not do behind one's back;
// `.ci/run` (for fresh CI machines, as root) installs it.
import { accessSync, constants } from 'node:fs'
import { sep } from 'node:path'
import type { TestProject } from 'vitest/node'

/** Debian's Chromium; KERFBOOK_CHROMIUM_PATH points the tests at another build of it. */
export const CHROMIUM_PATH = process.env.KERFBOOK_CHROMIUM_PATH || '/usr/bin/chromium'

export const CHROMIUM_MISSING =
  `Chromium not found at ${CHROMIUM_PATH}; the browser tests need it. Install it with \`apt-get install chromium\` (as root), ` +
  'or run only the engine and unit tests with `npx vitest run --project unit`.'

export function chromiumInstalled(): boolean {
  try {
    accessSync(CHROMIUM_PATH, constants.X_OK)
    return true
  } catch {
    return false
  }
}

/**
 * Whether this run includes any browser test file of `project`: all of them when vitest was given no file filters,
 * otherwise those the filters select (`npx vitest run --project app tests/api/jobs.test.ts` needs no browser).
 */
export async function runIncludesBrowserTests(project: TestProject): Promise<boolean> {
  // The command line's file filters; vitest keeps them on its instance without a public accessor, so when the field
  // is missing (another vitest version) every file of the project counts, and the check errs on the side of running.
  const filters = (project.vitest as unknown as { filenamePattern?: string[] }).filenamePattern
  const { testFiles } = await project.globTestFiles(filters)
  return testFiles.some((file) => file.includes(`${sep}tests${sep}browser${sep}`))
}

/** Stops the whole run with one line if it needs Chromium and the machine has none. */
export async function requireChromium(project: TestProject): Promise<void> {
  if (chromiumInstalled() || !(await runIncludesBrowserTests(project))) return
  // Exiting rather than throwing: vitest would wrap a thrown error in a stack trace and a misleading "No test files
  // found" report, burying the one thing to do.
  console.error(CHROMIUM_MISSING)
  process.exit(1)
}
