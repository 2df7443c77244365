import { defineConfig } from 'vitest/config'

// Two projects: `unit` runs the pure engine and unit tests without a server; `app` runs the API
// and browser tests against one built Nuxt server started by tests/setup/server.ts for the whole run.
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'unit',
          include: ['tests/analysis/**/*.test.ts', 'tests/unit/**/*.test.ts'],
          environment: 'node',
          // One fast-check seed for the whole run, overridable with KERFBOOK_FC_SEED (see the file).
          setupFiles: ['tests/setup/fast-check.ts'],
          // Engine tests do real work and share the CPUs with the server build and the app tests in CI: a refusal
          // that takes 1 s on a quiet machine took over 5 s there. A deadline catches a hang, not slowness.
          testTimeout: 30_000,
        },
      },
      {
        test: {
          name: 'app',
          include: ['tests/api/**/*.test.ts', 'tests/browser/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/setup/server.ts'],
          testTimeout: 60_000,
          hookTimeout: 300_000,
          fileParallelism: false,
        },
      },
    ],
  },
})
