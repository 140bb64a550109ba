// Defaults for the demo instance (`npm start`, `npm run dev`, `npm run db:*`). Every value can be
// overridden from the environment; tests never use these (they start their own services).
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { LOCAL } from "./paths";

export function demoDb(env: NodeJS.ProcessEnv = process.env) {
  return {
    host: env.DB_HOST ?? "127.0.0.1",
    port: Number(env.DB_PORT ?? 3407),
    user: env.DB_USER ?? "tidewire",
    password: env.DB_PASSWORD ?? "tidewire-local",
    database: env.DB_NAME ?? "tidewire",
  };
}

/** SESSION_SECRET from the environment, else one generated once and kept in .local/. */
export function sessionSecret(env: NodeJS.ProcessEnv = process.env): string {
  if (env.SESSION_SECRET) return env.SESSION_SECRET;
  const file = join(LOCAL, "session-secret");
  if (existsSync(file)) return readFileSync(file, "utf8").trim();
  mkdirSync(LOCAL, { recursive: true });
  const secret = randomBytes(32).toString("base64url");
  writeFileSync(file, secret + "\n", { mode: 0o600 });
  return secret;
}

/**
 * The full environment for the app and worker in the demo: database, the S3 and SMTP fakes,
 * mail sender, public URL. Values already set in `env` win.
 */
export function demoEnv(env: NodeJS.ProcessEnv = process.env): Record<string, string> {
  const db = demoDb(env);
  const host = env.HOST ?? "127.0.0.1";
  const port = env.PORT ?? "3000";
  const defaults: Record<string, string> = {
    DB_HOST: db.host,
    DB_PORT: String(db.port),
    DB_USER: db.user,
    DB_PASSWORD: db.password,
    DB_NAME: db.database,
    S3_ENDPOINT: "http://127.0.0.1:9320",
    S3_REGION: "us-east-1",
    S3_BUCKET: "tidewire",
    S3_ACCESS_KEY_ID: "S3RVER", // s3rver's documented default credentials
    S3_SECRET_ACCESS_KEY: "S3RVER",
    S3_FORCE_PATH_STYLE: "true",
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: "2525",
    SMTP_SECURE: "false",
    MAIL_FROM: "Tidewire <no-reply@tidewire.test>",
    MAIL_INBOX_PORT: "8025",
    HOST: host,
    PORT: port,
    APP_URL: `http://${host}:${port}`,
  };
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries(defaults)) out[k] = env[k] ?? v;
  out.SESSION_SECRET = sessionSecret(env);
  return out;
}
