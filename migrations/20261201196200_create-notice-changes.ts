import type { Knex } from "knex";

// What happened to which notice and when, as seen by the mail side: written by onNoticeEvent
// in the notice's own transaction. Digests read the changes inside their window from here.
export async function up(knex: Knex) {
  await knex.schema.createTable("notice_changes", (t) => {
    t.bigIncrements("id").primary();
    t.integer("notice_id").unsigned().notNullable().references("id").inTable("notices").onDelete("CASCADE");
    t.enum("kind", ["published", "amended", "cancelled", "expired"]).notNullable();
    t.integer("version").unsigned().notNullable();
    t.datetime("occurred_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.index(["occurred_at", "id"]);
    t.index(["notice_id", "id"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("notice_changes");
}
