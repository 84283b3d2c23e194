import { defineConfig } from '@playwright/test';
import { CHROMIUM } from './e2e/chromium';
import ports from './server/default-ports.json';

/** Ports of the e2e run (its own server, database and mail catcher). */
export const E2E = {
  port: Number(process.env.E2E_PORT ?? ports.e2eServer),
  smtpPort: Number(process.env.E2E_SMTP_PORT ?? ports.e2eSmtp),
  mailUiPort: Number(process.env.E2E_MAIL_UI_PORT ?? ports.e2eMailUi),
};

export default defineConfig({
  testDir: 'e2e',
  testMatch: '**/*.e2e.spec.ts',
  outputDir: 'test-results/e2e',
  fullyParallel: false,
  workers: 1,
  retries: process.env.CI ? 1 : 0,
  timeout: 60_000,
  expect: { timeout: 10_000 },
  reporter: [['list'], ['html', { open: 'never', outputFolder: 'playwright-report' }]],
  use: {
    baseURL: `http://127.0.0.1:${E2E.port}`,
    trace: 'retain-on-failure',
    screenshot: 'only-on-failure',
    viewport: { width: 1280, height: 800 },
    launchOptions: CHROMIUM,
  },
  // Playwright starts webServer before globalSetup, so this command starts the database too.
  webServer: {
    command: 'node scripts/e2e-server.mjs',
    url: `http://127.0.0.1:${E2E.port}/api/health`,
    reuseExistingServer: false,
    timeout: 120_000,
    stdout: 'pipe',
    stderr: 'pipe',
  },
});
