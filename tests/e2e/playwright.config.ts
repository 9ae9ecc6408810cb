import { defineConfig, devices } from "@playwright/test";
import { join } from "node:path";

const root = join(import.meta.dirname, "..", "..");
const port = Number(process.env.E2E_PORT ?? 3100);

export default defineConfig({
  testDir: ".",
  outputDir: join(root, "test-results", port === 3100 ? "e2e" : `e2e-${port}`),
  fullyParallel: false,
  workers: 1,
  retries: 0,
  timeout: 60_000,
  expect: { timeout: 10_000 },
  reporter: [
    ["list"],
    ["html", { outputFolder: join(root, port === 3100 ? "playwright-report" : `playwright-report-${port}`), open: "never" }],
  ],
  use: {
    baseURL: `http://127.0.0.1:${port}`,
    // API calls made by the tests (request contexts) come "from the app's own pages", as a browser's
    // would: state-changing routes refuse requests without the app's origin.
    extraHTTPHeaders: { origin: `http://127.0.0.1:${port}` },
    screenshot: "on",
    trace: "retain-on-failure",
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
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
  projects: [{ name: "chromium", use: { ...devices["Desktop Chrome"], channel: undefined } }],
  webServer: {
    command: `node ${join(root, "scripts", "e2e-server.mjs")}`,
    url: `http://127.0.0.1:${port}/sign-in`,
    timeout: 180_000,
    reuseExistingServer: false,
    stdout: "pipe",
    stderr: "pipe",
  },
});
