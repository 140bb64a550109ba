import type { Knex } from "knex";

// Triage history: one row per status change of a report (and its creation).
export async function up(knex: Knex) {
  await knex.schema.createTable("report_events", (t) => {
    t.increments("id").primary();
    t.integer("report_id").unsigned().notNullable().references("reports.id").onDelete("CASCADE");
    t.string("from_status", 20).nullable();
    t.string("to_status", 20).notNullable();
    t.string("note", 1000).nullable();
    t.integer("actor_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.integer("duplicate_of_id").unsigned().nullable();
    t.integer("notice_id").unsigned().nullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.index(["report_id", "created_at"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("report_events");
}
