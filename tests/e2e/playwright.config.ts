import { defineConfig, devices } from "@playwright/test";
import { join } from "node:path";

const root = join(import.meta.dirname, "..", "..");

export default defineConfig({
  testDir: ".",
  outputDir: join(root, "test-results", "e2e"),
  fullyParallel: false,
  workers: 1,
  retries: 0,
  timeout: 60_000,
  expect: { timeout: 10_000 },
  reporter: [["list"], ["html", { outputFolder: join(root, "playwright-report"), open: "never" }]],
  use: {
    baseURL: "http://127.0.0.1:3100",
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
    url: "http://127.0.0.1:3100/sign-in",
    timeout: 180_000,
    reuseExistingServer: false,
    stdout: "pipe",
    stderr: "pipe",
  },
});
