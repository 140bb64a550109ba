// `npm run test:a11y`: axe (WCAG 2.1 A and AA) on every public and staff page, signed in as the
// role that sees it, in Debian's Chromium against the production build on throwaway services.
import { join } from "node:path";
import { defineConfig, devices } from "@playwright/test";
import { CHROMIUM, CHROMIUM_ARGS } from "../../scripts/lib/chromium";
import { LOCAL } from "../../scripts/lib/paths";

export default defineConfig({
  testDir: ".",
  testMatch: "**/*.spec.ts",
  globalSetup: "./global-setup.ts",
  outputDir: join(LOCAL, "test-results-a11y"),
  workers: 2,
  retries: 0,
  timeout: 60_000,
  expect: { timeout: 10_000 },
  reporter: [["list"]],
  use: {
    ...devices["Desktop Chrome"],
    baseURL: process.env.QUALITY_BASE_URL,
    trace: "retain-on-failure",
    launchOptions: {
      executablePath: CHROMIUM,
      args: CHROMIUM_ARGS,
      env: { ...process.env, XDG_CONFIG_HOME: join(LOCAL, "xdg", "config"), XDG_CACHE_HOME: join(LOCAL, "xdg", "cache") } as Record<string, string>,
    },
  },
  projects: [{ name: "chromium" }],
});
