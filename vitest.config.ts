import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vitest/config';
import vue from '@vitejs/plugin-vue';

const alias = { '@': fileURLToPath(new URL('./src', import.meta.url)) };

// Three projects: `unit` (engine + server units, node), `client` (Vue components/stores, jsdom),
// `api` (supertest on createApp() against the throw-away MariaDB started by scripts/test.ts),
// `e2e` (playwright-core driving Debian chromium against the built app).
// Timeouts are generous everywhere: a test fails on a wrong answer, never on a slow machine (a unit test that evaluates
// every demo design can take several seconds on two busy cores); speed is measured by `npm run bench`, not here.
const UNIT_TIMEOUT_MS = 30000;
export default defineConfig({
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: 'unit',
          environment: 'node',
          include: ['tests/unit/**/*.test.ts'],
          exclude: ['tests/unit/client/**'],
          testTimeout: UNIT_TIMEOUT_MS,
        },
      },
      {
        plugins: [vue()],
        resolve: { alias },
        test: {
          name: 'client',
          environment: 'jsdom',
          include: ['tests/unit/client/**/*.test.ts'],
          testTimeout: UNIT_TIMEOUT_MS,
          server: { deps: { inline: ['element-plus'] } },
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'api',
          environment: 'node',
          include: ['tests/api/**/*.test.ts'],
          globalSetup: ['tests/helpers/apiGlobalSetup.ts'],
          testTimeout: 30000,
          hookTimeout: 60000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/helpers/e2eGlobalSetup.ts'],
          testTimeout: 60000,
          hookTimeout: 120000,
          fileParallelism: false,
        },
      },
    ],
  },
});
