import type { Knex } from "knex";

// Every change of an aid's status, with who changed it and why (a report, a notice, by hand).
export async function up(knex: Knex) {
  await knex.schema.createTable("aid_status_history", (t) => {
    t.increments("id").primary();
    t.integer("aid_id").unsigned().notNullable().references("aids.id").onDelete("CASCADE");
    t.string("from_status", 20).nullable();
    t.string("to_status", 20).notNullable();
    t.string("reason", 500).nullable();
    t.integer("report_id").unsigned().nullable(); // set when a confirmed report caused it
    t.integer("changed_by").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.datetime("changed_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.index(["aid_id", "changed_at"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("aid_status_history");
}
