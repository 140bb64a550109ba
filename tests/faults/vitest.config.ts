// `npm run test:faults`: each file starts its own stack (scripts/quality/stack.ts) because it
// kills and restarts parts of it; files run one after another.
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

export default defineConfig({
  root: fileURLToPath(new URL("../..", import.meta.url)),
  resolve: { alias: { "~": fileURLToPath(new URL("../../app", import.meta.url)) } },
  test: {
    name: "faults",
    include: ["tests/faults/**/*.test.ts"],
    environment: "node",
    fileParallelism: false,
    testTimeout: 180_000,
    hookTimeout: 240_000,
  },
});
