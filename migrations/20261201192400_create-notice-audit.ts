import type { Knex } from "knex";

// Append-only trail of every change to a notice: who, when, what changed, and the whole
// version after the change (so every published version can be read back).
export async function up(knex: Knex) {
  await knex.schema.createTable("notice_audit", (t) => {
    t.bigIncrements("id").primary();
    t.integer("notice_id").unsigned().notNullable().references("notices.id");
    t.integer("actor_user_id").unsigned().nullable().references("users.id"); // null: the system (expiry)
    t.string("action", 20).notNullable(); // created, edited, published, amended, cancelled, superseded, expired
    t.integer("version").unsigned().notNullable(); // the notice's version after this change
    t.text("changes").notNullable(); // JSON: { field: [before, after] }
    t.text("snapshot", "longtext").notNullable(); // JSON: the notice and its parts after the change
    t.text("reason").nullable();
    t.datetime("at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.index(["notice_id", "id"]);
    t.index(["action", "at"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("notice_audit");
}
