import { z } from "zod";

// Every setting the server reads, validated once at start-up. A bad value stops the process
// with a message naming the variable, instead of failing later on first use.
const boolish = z
  .enum(["true", "false", "1", "0"])
  .transform((v) => v === "true" || v === "1");

const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  HOST: z.string().default("127.0.0.1"),
  PORT: z.coerce.number().int().min(1).max(65535).default(3000),
  APP_URL: z.url().default("http://127.0.0.1:3000"),
  SESSION_SECRET: z.string().min(32, "must be at least 32 characters").default("dev-only-secret-change-me-0123456789abcdef"),
  DB_HOST: z.string().default("127.0.0.1"),
  DB_PORT: z.coerce.number().int().min(1).max(65535).default(3407),
  DB_USER: z.string().default("tidewire"),
  DB_PASSWORD: z.string().default("tidewire-local"),
  DB_NAME: z.string().regex(/^[A-Za-z0-9_]+$/, "letters, digits and _ only").default("tidewire"),
  DB_POOL_MAX: z.coerce.number().int().min(1).max(200).default(10),
  S3_ENDPOINT: z.url().optional(),
  S3_REGION: z.string().default("us-east-1"),
  S3_BUCKET: z.string().min(3).default("tidewire"),
  S3_ACCESS_KEY_ID: z.string().default("S3RVER"),
  S3_SECRET_ACCESS_KEY: z.string().default("S3RVER"),
  S3_FORCE_PATH_STYLE: boolish.default(true),
  SMTP_HOST: z.string().default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  SMTP_SECURE: boolish.default(false),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  MAIL_FROM: z.string().default("Kestrel Sound notices <notices@tidewire.invalid>"),
  /** Optional XYZ tile URL template for deployments with internet; offline base map otherwise. */
  MAP_TILE_URL: z.string().optional(),
  /** Trust X-Forwarded-For (only behind a reverse proxy you run). */
  TRUST_PROXY: boolish.default(false),
});

export type Env = z.infer<typeof schema>;

export function parseEnv(source: Record<string, string | undefined>): Env {
  const result = schema.safeParse(source);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Invalid environment configuration:\n${lines.join("\n")}`);
  }
  const env = result.data;
  if (env.NODE_ENV === "production" && env.SESSION_SECRET.startsWith("dev-only-")) {
    throw new Error("Invalid environment configuration:\n  SESSION_SECRET: must be set in production");
  }
  return env;
}

let cached: Env | undefined;
export function env(): Env {
  cached ??= parseEnv(process.env);
  return cached;
}
