// setupFiles entry for integration tests: the services' env (see vitest-global-setup.ts) into
// process.env, so app code reads DB_*, SMTP_* … exactly as in production.
import { inject } from "vitest";

Object.assign(process.env, inject("serviceEnv"), { NODE_ENV: "test" });
