import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'

const r = (p: string) => fileURLToPath(new URL(p, import.meta.url))
const alias = { '#shared': r('./shared'), '~~': r('./'), '@@': r('./') }

// Three projects: pure modules (unit), the built server over real HTTP (e2e),
// and Chromium through playwright-core (browser). e2e and browser share one built server.
export default defineConfig({
  test: {
    projects: [
      // Unit tests assert values, never speed (speed is `npm run bench`): a generous timeout so a
      // loaded machine does not fail them.
      { resolve: { alias }, test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node', testTimeout: 60_000 } },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/support/global-setup.ts'],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'browser',
          include: ['tests/browser/**/*.test.ts'],
          globalSetup: ['tests/support/global-setup.ts'],
          fileParallelism: false,
          testTimeout: 120_000,
          hookTimeout: 120_000,
        },
      },
    ],
  },
})
