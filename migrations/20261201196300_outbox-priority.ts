import type { Knex } from "knex";

// Claim order: urgent alerts first, digests last, so an alert queued during a digest run does
// not wait behind thousands of digests. 1 = alert, 5 = default (account, report mail), 9 = digest.
export async function up(knex: Knex) {
  await knex.schema.alterTable("outbox", (t) => {
    t.tinyint("priority").unsigned().notNullable().defaultTo(5);
    t.index(["status", "priority", "run_at", "id"], "outbox_claim_order");
  });
}

export async function down(knex: Knex) {
  await knex.schema.alterTable("outbox", (t) => {
    t.dropIndex(["status", "priority", "run_at", "id"], "outbox_claim_order");
    t.dropColumn("priority");
  });
}
