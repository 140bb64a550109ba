import type { Knex } from "knex";

// The last number issued in each harbour's series per year. Publishing locks this row
// (SELECT … FOR UPDATE) in the publishing transaction, so numbers are unique and gap-free:
// a rolled-back publish gives its number back.
export async function up(knex: Knex) {
  await knex.schema.createTable("notice_number_counters", (t) => {
    t.integer("harbour_id").unsigned().notNullable().references("harbours.id");
    t.smallint("year").unsigned().notNullable();
    t.integer("last_number").unsigned().notNullable().defaultTo(0);
    t.primary(["harbour_id", "year"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("notice_number_counters");
}
