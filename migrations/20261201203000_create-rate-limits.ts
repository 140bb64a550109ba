import type { Knex } from "knex";

// The table rate-limiter-flexible's MySQL store expects (key, points, expire in ms), created
// here so the app never runs DDL at request time.
export async function up(knex: Knex) {
  await knex.schema.createTable("rate_limits", (t) => {
    t.string("key", 255).primary();
    t.integer("points").notNullable().defaultTo(0);
    t.bigInteger("expire").unsigned().nullable().index();
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("rate_limits");
}
