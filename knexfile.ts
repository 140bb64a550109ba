// Knex configuration from the environment (same variable names as the app). Used by
// scripts/migrate.ts, scripts/seed.ts and the test harness through knex's API: the knex CLI
// cannot load TypeScript in this ESM package (`npx knex` / `knex --esm` fail).
import type { Knex } from "knex";

export function knexConfig(env: NodeJS.ProcessEnv = process.env): Knex.Config {
  return {
    client: "mysql2",
    connection: {
      host: env.DB_HOST ?? "127.0.0.1",
      port: Number(env.DB_PORT ?? 3407),
      user: env.DB_USER ?? "tidewire",
      password: env.DB_PASSWORD ?? "tidewire-local",
      database: env.DB_NAME ?? "tidewire",
      // No `charset` here on purpose: with one set, knex appends a default collation and new
      // tables get utf8mb4_general_ci instead of the server's utf8mb4_uca1400_ai_ci.
    },
    pool: { min: 0, max: 5 },
    migrations: {
      directory: "./migrations",
      tableName: "knex_migrations",
      loadExtensions: [".ts"],
      extension: "ts",
    },
    seeds: {
      directory: "./seeds",
      loadExtensions: [".ts"],
      extension: "ts",
    },
  };
}

export default knexConfig();
