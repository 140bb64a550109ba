// Migrations and seeds through knex's programmatic API. The files are loaded with our own
// `import()` (a custom migrationSource) rather than knex's loader: knex's native import() of a
// .ts file works under tsx but not inside Vitest (its module runner only transforms imports
// made from project code), and the knex CLI cannot load TypeScript in this ESM package at all.
// Migration names stored in knex_migrations are the bare file names, as knex's own loader uses.
import { existsSync, readdirSync } from "node:fs";
import { join } from "node:path";
import knex, { type Knex } from "knex";
import { knexConfig } from "../../knexfile";
import { ROOT } from "./paths";

export const MIGRATIONS_DIR = join(ROOT, "migrations");
export const SEEDS_DIR = join(ROOT, "seeds");

function tsFiles(dir: string): string[] {
  if (!existsSync(dir)) return [];
  return readdirSync(dir)
    .filter((f) => f.endsWith(".ts") && !f.endsWith(".d.ts"))
    .sort();
}

export const migrationSource: Knex.MigrationSource<string> = {
  getMigrations: async () => tsFiles(MIGRATIONS_DIR),
  getMigrationName: (file) => file,
  getMigration: (file) => import(/* @vite-ignore */ join(MIGRATIONS_DIR, file)),
};

/** Knex config for DB_* in `env`, with migrations read through `migrationSource`. */
export function opsConfig(env: NodeJS.ProcessEnv = process.env): Knex.Config {
  const c = knexConfig(env);
  return { ...c, migrations: { tableName: c.migrations?.tableName, migrationSource } };
}

async function withKnex<T>(env: NodeJS.ProcessEnv, fn: (db: Knex) => Promise<T>): Promise<T> {
  const db = knex(opsConfig(env));
  try {
    return await fn(db);
  } finally {
    await db.destroy();
  }
}

/** Runs every pending migration; returns the file names applied. */
export async function migrateLatest(env: NodeJS.ProcessEnv = process.env): Promise<string[]> {
  return withKnex(env, async (db) => {
    const [, applied] = (await db.migrate.latest()) as [number, string[]];
    return applied;
  });
}

/** Rolls back every applied migration (all batches); returns the file names undone. */
export async function rollbackAll(env: NodeJS.ProcessEnv = process.env): Promise<string[]> {
  return withKnex(env, async (db) => {
    const [, undone] = (await db.migrate.rollback(undefined, true)) as [number, string[]];
    return undone;
  });
}

export async function migrationStatus(
  env: NodeJS.ProcessEnv = process.env,
): Promise<{ completed: string[]; pending: string[] }> {
  return withKnex(env, async (db) => {
    const [completed, pending] = (await db.migrate.list()) as [Array<{ name: string }>, string[]];
    return { completed: completed.map((m) => m.name), pending };
  });
}

/**
 * Runs every seeds/*.ts in name order, each exporting `seed(knex)` (knex's seed format; seeds
 * are written to be idempotent). Loaded with our own import() for the same reason as above.
 */
export async function runSeeds(env: NodeJS.ProcessEnv = process.env): Promise<string[]> {
  const files = tsFiles(SEEDS_DIR);
  if (files.length === 0) return [];
  return withKnex(env, async (db) => {
    for (const f of files) {
      const mod = (await import(/* @vite-ignore */ join(SEEDS_DIR, f))) as { seed?: (k: Knex) => Promise<unknown> };
      if (typeof mod.seed !== "function") throw new Error(`seeds/${f} does not export seed(knex)`);
      await mod.seed(db);
    }
    return files;
  });
}
