/**
 * End-to-end tests (tests/e2e) against a production build in .next-test, on test-only ports:
 * the app on http://localhost:3100 and the mail sink on 127.0.0.1:2526 (mail in .data/test/outbox,
 * exported to tests as OUTBOX_DIR). `npm test` builds .next-test, starts a fresh test database and
 * passes DATABASE_URL, AUTH_SECRET and DEMO_PASSWORD; the defaults below cover the rest.
 * Browser: Debian's Chromium (/usr/bin/chromium); never run `playwright install`.
 */
import path from 'node:path';
import { defineConfig, devices } from '@playwright/test';

const APP_URL = 'http://localhost:3100';
const outbox = path.resolve(__dirname, '.data/test/outbox');

// Seen by the web servers below and by the test workers.
process.env.OUTBOX_DIR ??= outbox;
process.env.AUTH_URL ??= APP_URL;
process.env.APP_URL ??= APP_URL;
process.env.AUTH_TRUST_HOST ??= 'true';
process.env.SMTP_HOST ??= '127.0.0.1';
process.env.SMTP_PORT ??= '2526';
process.env.SMTP_SECURE ??= 'false';
process.env.MAIL_FROM ??= 'Unitwise <no-reply@unitwise.local>';
process.env.NEXT_TELEMETRY_DISABLED = '1';

export default defineConfig({
  testDir: 'tests/e2e',
  outputDir: '.data/test/results',
  workers: 1,
  retries: process.env.CI ? 1 : 0,
  forbidOnly: !!process.env.CI,
  reporter: [['list'], ['json', { outputFile: '.data/test/playwright.json' }]],
  use: {
    baseURL: APP_URL,
    trace: 'retain-on-failure',
    screenshot: 'only-on-failure',
  },
  projects: [
    {
      name: 'chromium',
      use: {
        ...devices['Desktop Chrome'],
        launchOptions: {
          executablePath: '/usr/bin/chromium',
          args: [
            '--no-sandbox',
            '--disable-gpu',
            '--disable-dev-shm-usage',
            '--disable-background-networking',
            '--disable-component-update',
            '--disable-sync',
            '--disable-quic',
            '--no-first-run',
          ],
        },
      },
    },
  ],
  webServer: [
    {
      name: 'mail',
      command: `node scripts/mail-sink.mjs --port ${process.env.SMTP_PORT} --dir ${JSON.stringify(process.env.OUTBOX_DIR)}`,
      port: Number(process.env.SMTP_PORT),
      reuseExistingServer: false,
      timeout: 20_000,
      gracefulShutdown: { signal: 'SIGTERM', timeout: 3_000 },
    },
    {
      // The web server as deployed (`npm run serve`), on loopback like `npm start`.
      name: 'web',
      command: 'node --import tsx scripts/serve.ts --port 3100',
      url: `${APP_URL}/api/health`,
      // One browser plays many people from one address: the specs mark each person with their own
      // X-Forwarded-For (trusted here as if behind a proxy), and the limits are scaled up. The
      // outbox page is on, as under `npm start`, for requests without that header.
      env: { NEXT_DIST_DIR: '.next-test', NODE_ENV: 'production', TRUST_PROXY: 'true', RATE_LIMIT_SCALE: '20', DEV_OUTBOX: 'true' },
      reuseExistingServer: false,
      timeout: 120_000,
      gracefulShutdown: { signal: 'SIGTERM', timeout: 5_000 },
    },
    {
      // The stress-test worker (as `npm run worker`): ready once it says it is taking chunks.
      name: 'worker',
      command: 'node --import tsx lib/jobs/worker-main.ts',
      wait: { stdout: /taking stress-test chunks/ },
      stdout: 'pipe',
      reuseExistingServer: false,
      timeout: 60_000,
      gracefulShutdown: { signal: 'SIGTERM', timeout: 12_000 },
    },
  ],
});
