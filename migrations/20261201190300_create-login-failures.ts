import type { Knex } from "knex";

export async function up(knex: Knex) {
  await knex.schema.createTable("login_failures", (t) => {
    t.bigIncrements("id").primary();
    t.enum("scope", ["account", "address"]).notNullable();
    t.string("key", 254).notNullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.index(["scope", "key", "created_at"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("login_failures");
}
