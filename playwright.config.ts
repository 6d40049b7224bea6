import { defineConfig, devices } from "@playwright/test";

/**
 * Browser end-to-end tests against `next start` on a free loopback port, driving Debian's
 * Chromium (never a downloaded browser). tests/e2e/global-setup.ts builds the database and
 * starts the server; `npm run test:e2e` builds the app first.
 */
export default defineConfig({
  testDir: "tests/e2e",
  globalSetup: "./tests/e2e/global-setup.ts",
  outputDir: "test-results/e2e",
  fullyParallel: true,
  workers: 2,
  retries: 0,
  timeout: 60_000,
  expect: { timeout: 10_000 },
  reporter: [["list"], ["html", { open: "never", outputFolder: "playwright-report" }]],
  use: {
    screenshot: "on",
    trace: "retain-on-failure",
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
      args: [
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
  projects: [
    { name: "desktop", use: { ...devices["Desktop Chrome"] }, testIgnore: /tablet\.spec\.ts/ },
    {
      name: "tablet",
      use: { viewport: { width: 820, height: 1180 }, hasTouch: true, isMobile: false },
      testMatch: /tablet\.spec\.ts/,
    },
  ],
});
