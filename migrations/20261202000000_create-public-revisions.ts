import type { Knex } from "knex";

// A revision token per public data set, replaced by triggers on every write to the table that
// feeds it, so a page can tell cheaply and exactly whether what it shows may have changed (its
// validator, before any heavy query). A fresh UUID, not a counter or a timestamp: two
// transactions serialise on the token's row, so a reader that saw the first commit sees a
// different token after the second, and a reset database never repeats an earlier value.
const TABLES = ["notices", "aids"] as const;
const EVENTS = ["INSERT", "UPDATE", "DELETE"] as const;

export async function up(knex: Knex) {
  await knex.schema.createTable("public_revisions", (t) => {
    t.string("name", 32).primary();
    t.specificType("token", "CHAR(36)").notNullable();
    t.datetime("changed_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
  });
  for (const table of TABLES) {
    for (const event of EVENTS) {
      await knex.raw(`CREATE TRIGGER ${table}_revision_${event.toLowerCase()} AFTER ${event} ON ${table} FOR EACH ROW
        INSERT INTO public_revisions (name, token, changed_at) VALUES ('${table}', UUID(), CURRENT_TIMESTAMP(3))
        ON DUPLICATE KEY UPDATE token = UUID(), changed_at = CURRENT_TIMESTAMP(3)`);
    }
  }
}

export async function down(knex: Knex) {
  for (const table of TABLES) for (const event of EVENTS) await knex.raw(`DROP TRIGGER IF EXISTS ${table}_revision_${event.toLowerCase()}`);
  await knex.schema.dropTable("public_revisions");
}
