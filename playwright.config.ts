import { defineConfig } from '@playwright/test';

const port = Number(process.env.PORT ?? 3100);
/** The server's stderr, kept so the security suite can check that no request data is logged. */
export const SERVER_LOG = '.data/reports/server-e2e.log';

export default defineConfig({
  testDir: 'tests/e2e',
  fullyParallel: false,
  workers: 1,
  retries: 0,
  reporter: [['list']],
  // Generous: the suite must pass on a loaded 2-core machine; tests wait for states, never for time.
  timeout: 90_000,
  expect: { timeout: 15_000 },
  use: {
    baseURL: `http://127.0.0.1:${port}`,
    trace: 'off',
    screenshot: 'only-on-failure',
    launchOptions: {
      // Debian's Chromium; Playwright never downloads a browser here.
      executablePath: '/usr/bin/chromium',
      args: [
        '--no-sandbox',
        '--disable-gpu',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
      ],
    },
  },
  webServer: {
    command: `mkdir -p .data/reports && : > ${SERVER_LOG} && exec bash -c 'exec node_modules/.bin/next start -H 127.0.0.1 -p ${port} 2> >(tee -a ${SERVER_LOG} >&2)'`,
    url: `http://127.0.0.1:${port}/api/health`,
    reuseExistingServer: false,
    timeout: 60_000,
    stdout: 'ignore',
    stderr: 'pipe',
  },
});
