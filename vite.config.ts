import { reactRouter } from '@react-router/dev/vite'
import tailwindcss from '@tailwindcss/vite'
import { defineConfig } from 'vitest/config'

// Vitest loads this file too; the React Router plugin is left out there (it would try to
// build the app), as the usual React Router setups do.
const underVitest = Boolean(process.env.VITEST)

export default defineConfig({
  plugins: underVitest ? [] : [tailwindcss(), reactRouter()],
  server: { host: '127.0.0.1' },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          environment: 'node',
          include: [
            'app/**/*.test.{ts,tsx}',
            'jobs/**/*.test.ts',
            'seed/**/*.test.ts',
            'scripts/**/*.test.ts',
            'tests/reference/**/*.test.ts',
          ],
          testTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'integration',
          environment: 'node',
          include: ['tests/integration/**/*.test.ts'],
          globalSetup: ['tests/support/global-setup.ts'],
          setupFiles: ['tests/support/db-per-file.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['tests/e2e/**/*.spec.ts'],
          globalSetup: ['tests/support/e2e-setup.ts'],
          testTimeout: 90_000,
          hookTimeout: 240_000,
          fileParallelism: false,
        },
      },
    ],
  },
})
