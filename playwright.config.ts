// End-to-end tests in Debian's Chromium against a production build served on a free port, with
// throwaway services (tests/support/e2e-global-setup.ts). The global setup sets E2E_BASE_URL in
// process.env; Playwright's workers start after it and load this file again, so they see it.
import { join } from "node:path";
import { defineConfig, devices } from "@playwright/test";
import { CHROMIUM, CHROMIUM_ARGS } from "./scripts/lib/chromium";
import { LOCAL } from "./scripts/lib/paths";

export default defineConfig({
  testDir: "tests/e2e",
  globalSetup: "./tests/support/e2e-global-setup.ts",
  outputDir: join(LOCAL, "test-results"),
  // One shared database: tests create their own users, so files can run side by side.
  workers: 2,
  retries: 0,
  forbidOnly: !!process.env.CI,
  timeout: 30_000,
  expect: { timeout: 10_000 },
  reporter: [["list"]],
  use: {
    ...devices["Desktop Chrome"],
    baseURL: process.env.E2E_BASE_URL,
    trace: "retain-on-failure",
    launchOptions: {
      executablePath: CHROMIUM,
      args: CHROMIUM_ARGS,
      // Chromium writes its profile and caches under XDG dirs, else under $HOME.
      env: {
        ...process.env,
        XDG_CONFIG_HOME: join(LOCAL, "xdg", "config"),
        XDG_CACHE_HOME: join(LOCAL, "xdg", "cache"),
      } as Record<string, string>,
    },
  },
  projects: [{ name: "chromium" }],
});
