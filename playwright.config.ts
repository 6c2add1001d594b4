import { defineConfig, devices } from "@playwright/test";

// Browser tests run Debian's chromium (never a downloaded browser) against `next start` on a fresh
// database. tests/run-all.sh builds the app first; run `npx next build` before `npx playwright test`.
// E2E_PORT / E2E_SMTP_PORT let several checkouts run their browser tests at once on one machine.
const PORT = Number(process.env.E2E_PORT ?? 3210);
const SMTP_PORT = process.env.E2E_SMTP_PORT ?? "2626";
const BASE_URL = `http://127.0.0.1:${PORT}`;
const E2E_DB = PORT === 3210 ? "data/e2e-playwright.db" : `data/e2e-playwright-${PORT}.db`;
const isCI = Boolean(process.env.CI);

export default defineConfig({
  testDir: "tests/e2e",
  outputDir: "test-results/e2e",
  fullyParallel: false,
  workers: 1,
  retries: isCI ? 1 : 0,
  forbidOnly: isCI,
  timeout: 30_000,
  expect: { timeout: 10_000 },
  reporter: isCI ? [["list"]] : [["list"], ["html", { open: "never", outputFolder: "playwright-report" }]],
  use: {
    baseURL: BASE_URL,
    screenshot: "only-on-failure",
    trace: "retain-on-failure",
    locale: "en-GB",
    timezoneId: "UTC",
  },
  projects: [
    {
      name: "chromium",
      use: {
        ...devices["Desktop Chrome"],
        launchOptions: {
          executablePath: "/usr/bin/chromium",
          args: [
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--disable-quic",
            "--no-first-run",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
          ],
        },
      },
    },
  ],
  webServer: {
    // Plain sh: a fresh database every run, then the production server built by `next build`.
    command: `rm -f ${E2E_DB} ${E2E_DB}-journal ${E2E_DB}-wal ${E2E_DB}-shm && mkdir -p data && npx next start -p ${PORT} -H 127.0.0.1`,
    url: BASE_URL,
    reuseExistingServer: false,
    timeout: 120_000,
    stdout: "pipe",
    stderr: "pipe",
    env: {
      DATABASE_URL: `file:${E2E_DB}`,
      FAKE_SMTP: "1",
      FAKE_SMTP_PORT: SMTP_PORT,
      OUTBOX_ENABLED: "1",
      SEED_DEMO: "1",
      COOKIE_SECURE: "false",
      APP_URL: BASE_URL,
      NEXT_TELEMETRY_DISABLED: "1",
    },
  },
});
