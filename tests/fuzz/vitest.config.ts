// `npm run test:fuzz`: HTTP-level tests against the production build on throwaway services
// (scripts/quality/vitest-stack-setup.ts starts them once per run).
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

export default defineConfig({
  root: fileURLToPath(new URL("../..", import.meta.url)),
  resolve: { alias: { "~": fileURLToPath(new URL("../../app", import.meta.url)) } },
  test: {
    name: "fuzz",
    include: ["tests/fuzz/**/*.test.ts"],
    environment: "node",
    globalSetup: ["scripts/quality/vitest-stack-setup.ts"],
    setupFiles: ["scripts/quality/vitest-stack-env.ts"],
    fileParallelism: false,
    testTimeout: 120_000,
    hookTimeout: 240_000,
  },
});
