import type { Knex } from "knex";

export async function up(knex: Knex) {
  await knex.schema.createTable("sessions", (t) => {
    t.string("id_hash", 64).primary(); // SHA-256 of the cookie's random id
    t.integer("user_id").unsigned().nullable().references("users.id").onDelete("CASCADE");
    t.text("data").notNullable();
    t.datetime("expires_at", { precision: 3 }).notNullable().index();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.index(["user_id"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("sessions");
}
