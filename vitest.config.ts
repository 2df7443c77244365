import { defineConfig } from 'vitest/config'

// Two projects: pure engine/unit tests run without a server; API tests share
// one built Nuxt server started by tests/setup/server.ts for the whole run.
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'unit',
          include: ['tests/analysis/**/*.test.ts', 'tests/unit/**/*.test.ts'],
          environment: 'node',
        },
      },
      {
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/setup/server.ts'],
          testTimeout: 30_000,
          hookTimeout: 300_000,
          fileParallelism: false,
        },
      },
    ],
  },
})
