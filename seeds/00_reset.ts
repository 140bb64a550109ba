import type { Knex } from "knex";

/** Seeds are idempotent: empty every application table, then each later seed fills its own. */
export async function seed(knex: Knex) {
  const [rows] = await knex.raw("SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE'");
  const tables = (rows as { name: string }[]).map((r) => r.name).filter((n) => !n.startsWith("knex_migrations"));
  await knex.transaction(async (trx) => {
    await trx.raw("SET FOREIGN_KEY_CHECKS = 0");
    for (const table of tables) await trx.raw("DELETE FROM ??", [table]);
    for (const table of tables) await trx.raw("ALTER TABLE ?? AUTO_INCREMENT = 1", [table]);
    await trx.raw("SET FOREIGN_KEY_CHECKS = 1");
  });
}
