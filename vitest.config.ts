import { defineConfig } from 'vitest/config';
import { fileURLToPath } from 'node:url';

const r = (p: string) => fileURLToPath(new URL(p, import.meta.url));
const alias = { '@': r('./src'), '@shared': r('./shared'), '@server': r('./server') };
const setupFiles = [r('./tests/helpers/fail-on-console-error.ts')];

// Three kinds of test: pure unit (shared/), API against the real PostgreSQL, and browser (Chromium).
// scripts/test.mjs starts the throwaway database and passes DATABASE_URL in: run them with `npm test`.
export default defineConfig({
  resolve: { alias },
  test: {
    pool: 'forks',
    projects: [
      {
        resolve: { alias },
        test: { name: 'shared', include: ['tests/shared/**/*.test.ts'], environment: 'node', setupFiles },
      },
      {
        resolve: { alias },
        test: {
          name: 'server',
          include: ['tests/server/**/*.test.ts'],
          environment: 'node',
          setupFiles,
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          setupFiles,
          fileParallelism: false,
          testTimeout: 90_000,
          hookTimeout: 90_000,
        },
      },
    ],
  },
});
