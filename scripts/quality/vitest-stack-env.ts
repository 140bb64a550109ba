// setupFiles entry: the stack's env into process.env (DB_*, SESSION_SECRET, TEST_MAIL_DIR …) so
// helpers such as tests/support/mail.ts work in quality suites too.
import { inject } from "vitest";

Object.assign(process.env, inject("stack").env, { QUALITY_BASE_URL: inject("stack").baseURL });
