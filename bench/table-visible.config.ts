/**
 * The line-table measurements as a Playwright run (the end-to-end set-up: seeded test database, `next start`
 * of the current build, Debian's Chromium):
 *   <PORT VARS> SKIP_BUILD=1 bash /work/tools/e2e.sh -c bench/table-visible.config.ts   (or without SKIP_BUILD
 *   after a change), or against a server already running: BASE=http://127.0.0.1:3000 npx playwright test
 *   -c bench/table-visible.config.ts
 */
import base from '../playwright.config';
import { defineConfig } from '@playwright/test';

export default defineConfig({
  ...base,
  testDir: '.',
  testMatch: '**/bench/table-visible.ts',
  timeout: 600_000,
  // The server starts from the checkout's root (run from there), not from bench/.
  ...(process.env.BASE
    ? { webServer: undefined, use: { ...base.use, baseURL: process.env.BASE } }
    : { webServer: { ...(base.webServer as object), cwd: process.cwd() } as typeof base.webServer }),
});
