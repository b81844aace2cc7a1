// One vitest configuration with a project per kind of test. The api and e2e projects share one
// PostgreSQL database, so their files run one at a time.
import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vitest/config';
import vue from '@vitejs/plugin-vue';

const alias = {
  '@': fileURLToPath(new URL('./frontend/src', import.meta.url)),
  '@domain': fileURLToPath(new URL('./backend/src/domain', import.meta.url)),
  '@contracts': fileURLToPath(new URL('./backend/src/contracts', import.meta.url)),
  '@backend': fileURLToPath(new URL('./backend/src', import.meta.url)),
};

export default defineConfig({
  test: {
    projects: [
      {
        resolve: { alias },
        // Time limits are a guard against a hang, not a speed test (the benches measure speed): some unit
        // tests render a PDF and read it back with pdftotext, which on a loaded machine takes seconds.
        test: { name: 'unit', environment: 'node', include: ['tests/unit/**/*.test.ts'], exclude: ['tests/unit/frontend/**'], testTimeout: 15000 },
      },
      {
        plugins: [vue()],
        resolve: { alias },
        test: { name: 'frontend', environment: 'happy-dom', include: ['tests/unit/frontend/**/*.test.ts'], testTimeout: 15000 },
      },
      {
        resolve: { alias },
        test: {
          name: 'api',
          environment: 'node',
          include: ['tests/api/**/*.test.ts'],
          fileParallelism: false,
          globalSetup: ['tests/api/global-setup.ts'],
          setupFiles: ['tests/api/no-overlapping-queries.ts'],
          testTimeout: 20000,
          hookTimeout: 60000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['tests/e2e/**/*.test.ts'],
          fileParallelism: false,
          globalSetup: ['tests/e2e/global-setup.ts'],
          // Every screenshot and every session's last page is also checked with axe (tests/e2e/browser.ts),
          // about a second each on this shared machine; a long journey needs the room.
          testTimeout: 120000,
          hookTimeout: 120000,
        },
      },
    ],
  },
});
