import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // Tests build into their own folder so a running demo is never overwritten.
  buildDirectory: process.env.BUILD_DIR ?? "build",
  future: {
    v8_middleware: true,
    v8_splitRouteModules: true,
    v8_viteEnvironmentApi: true,
    v8_passThroughRequests: true,
    v8_trailingSlashAwareDataRequests: true,
  },
} satisfies Config;
