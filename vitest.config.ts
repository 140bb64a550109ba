// Vitest has its own config so the React Router Vite plugin (vite.config.ts) is not loaded.
// Two projects: `unit` (pure code, no services) and `integration` (real MariaDB and fakes,
// started once per run by tests/support/vitest-global-setup.ts).
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

export default defineConfig({
  resolve: { alias: { "~": fileURLToPath(new URL("./app", import.meta.url)) } },
  test: {
    projects: [
      {
        extends: true,
        test: { name: "unit", include: ["tests/unit/**/*.test.ts"], environment: "node" },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          environment: "node",
          globalSetup: ["tests/support/vitest-global-setup.ts"],
          setupFiles: ["tests/support/vitest-worker-env.ts"],
          // One database for the whole run: files run one after another so they never see
          // each other's rows half-way. Tests inside a file run in order as usual.
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
    ],
  },
});
