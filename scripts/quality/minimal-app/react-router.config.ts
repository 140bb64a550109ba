// The framework's floor for the load benchmark: a minimal React Router app (one page, no data,
// no database), built like Tidewire and served by the same scripts/serve.ts (BUILD_DIR).
import { fileURLToPath } from "node:url";
import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  appDirectory: "app",
  buildDirectory: fileURLToPath(new URL("../../../.local/minimal-app-build", import.meta.url)),
  future: {
    v8_middleware: true,
    v8_splitRouteModules: true,
    v8_viteEnvironmentApi: true,
    v8_passThroughRequests: true,
    v8_trailingSlashAwareDataRequests: true,
  },
} satisfies Config;
