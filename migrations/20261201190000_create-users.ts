import type { Knex } from "knex";

export async function up(knex: Knex) {
  await knex.schema.createTable("users", (t) => {
    t.increments("id").primary();
    t.string("email", 254).notNullable().unique();
    t.string("name", 120).notNullable();
    t.enum("role", ["boater", "officer", "harbourmaster", "admin"]).notNullable().defaultTo("boater");
    t.string("password_hash", 100).nullable();
    t.datetime("email_verified_at", { precision: 3 }).nullable();
    t.datetime("disabled_at", { precision: 3 }).nullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.datetime("updated_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("users");
}
