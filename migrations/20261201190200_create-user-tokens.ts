import type { Knex } from "knex";

export async function up(knex: Knex) {
  await knex.schema.createTable("user_tokens", (t) => {
    t.increments("id").primary();
    t.integer("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.enum("purpose", ["verify_email", "reset_password", "invite"]).notNullable();
    t.string("token_hash", 64).notNullable().unique();
    t.datetime("expires_at", { precision: 3 }).notNullable();
    t.datetime("used_at", { precision: 3 }).nullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("user_tokens");
}
