import { defineConfig } from 'vitest/config'
import { defineVitestProject } from '@nuxt/test-utils/config'

// Five projects, cheapest first: the pure engine and utilities, composables in a Nuxt environment,
// the API against a built server and a real MariaDB, end-to-end runs in Debian's chromium, and, in a
// group of their own, the fault tests that take MariaDB and the network away while attempts are saved.
export default defineConfig({
  test: {
    projects: [
      {
        test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' },
      },
      await defineVitestProject({
        // Starting the Nuxt environment can outlast vitest's 10 s default on a busy machine.
        test: { name: 'nuxt', include: ['tests/nuxt/**/*.test.ts'], environment: 'nuxt', hookTimeout: 60_000 },
      }),
      {
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          environment: 'node',
          testTimeout: 30_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          testTimeout: 60_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
      {
        test: {
          name: 'faults',
          include: ['tests/faults/**/*.test.ts'],
          environment: 'node',
          testTimeout: 180_000,
          hookTimeout: 120_000,
          fileParallelism: false,
          // These stop and start the test MariaDB and take the network away: in a group of their own, so no
          // other project's tests run beside them.
          sequence: { groupOrder: 1 },
        },
      },
    ],
  },
})
