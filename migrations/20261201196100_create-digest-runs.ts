import type { Knex } from "knex";

// One row per (subscription, digest period): written in the same transaction as the digest's
// outbox row, so a digest period is built once and the next window starts where this one ended.
export async function up(knex: Knex) {
  await knex.schema.createTable("digest_runs", (t) => {
    t.bigIncrements("id").primary();
    t.integer("subscription_id").unsigned().notNullable().references("id").inTable("subscriptions").onDelete("CASCADE");
    t.string("period_key", 20).notNullable(); // D2026-12-01 or W2026-11-30 (local dates)
    t.datetime("window_from", { precision: 3 }).notNullable();
    t.datetime("window_to", { precision: 3 }).notNullable();
    t.integer("item_count").unsigned().notNullable();
    t.string("outbox_key", 191).nullable(); // null when there was nothing to send
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.unique(["subscription_id", "period_key"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("digest_runs");
}
