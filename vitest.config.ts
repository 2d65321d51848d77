import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'
import { defineVitestProject } from '@nuxt/test-utils/config'

const shared = fileURLToPath(new URL('./shared', import.meta.url))

// `npm test` (scripts/test.mjs) starts MariaDB and one built server, then runs this with
// PHASELOOM_BASE_URL and PHASELOOM_DATABASE_URL set. The unit and nuxt projects need neither.
export default defineConfig({
  test: {
    // Two cores: run test files one or two at a time, never more.
    maxWorkers: 2,
    projects: [
      {
        test: {
          name: 'unit',
          environment: 'node',
          include: ['tests/unit/**/*.test.ts'],
          // the property tests run hundreds of solves: room for a busy machine, not a speed check
          testTimeout: 30_000,
        },
        resolve: { alias: { '#shared': shared } },
      },
      await defineVitestProject({
        test: {
          name: 'nuxt',
          include: ['tests/nuxt/**/*.test.ts'],
          testTimeout: 30_000,
          environmentOptions: { nuxt: { domEnvironment: 'happy-dom' } },
        },
      }),
      {
        test: {
          name: 'api',
          environment: 'node',
          include: ['tests/api/**/*.test.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
        resolve: { alias: { '#shared': shared } },
      },
      {
        test: {
          name: 'browser',
          environment: 'node',
          include: ['tests/browser/**/*.test.ts'],
          // one Chromium at a time on a two-core machine
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 60_000,
        },
      },
    ],
  },
})
