import { defineConfig, devices } from "@playwright/test";

const PORT = 3410;
const BASE_URL = `http://127.0.0.1:${PORT}`;

/** Browser tests in Debian's Chromium against a production build on the e2e database. */
export default defineConfig({
  testDir: "tests/e2e",
  // the artifacts get their own folder: Playwright empties outputDir at start
  outputDir: "test-results/e2e-artifacts",
  // tests share one database and the machine has two cores
  fullyParallel: false,
  workers: 1,
  retries: process.env.CI ? 1 : 0,
  forbidOnly: !!process.env.CI,
  // generous: the suite shares two cores with builds and other test runs
  timeout: 90_000,
  expect: { timeout: 15_000 },
  reporter: [["list"], ["json", { outputFile: "test-results/e2e.json" }]],
  use: {
    baseURL: BASE_URL,
    trace: "retain-on-failure",
    screenshot: "only-on-failure",
    locale: "en-GB",
    timezoneId: "UTC",
  },
  projects: [
    {
      name: "chromium",
      use: {
        ...devices["Desktop Chrome"],
        launchOptions: {
          executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
          args: [
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
            "--no-first-run",
            "--disable-quic",
          ],
        },
      },
    },
  ],
  webServer: {
    command: "bash scripts/e2e-server.sh",
    url: `${BASE_URL}/sign-in`,
    // a build may run first when .next is missing
    timeout: 300_000,
    reuseExistingServer: !process.env.CI,
    stdout: "pipe",
    stderr: "pipe",
    gracefulShutdown: { signal: "SIGTERM", timeout: 5_000 },
  },
});
