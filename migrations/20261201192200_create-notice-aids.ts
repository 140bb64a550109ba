import type { Knex } from "knex";

export async function up(knex: Knex) {
  await knex.schema.createTable("notice_aids", (t) => {
    t.integer("notice_id").unsigned().notNullable().references("notices.id").onDelete("CASCADE");
    t.integer("aid_id").unsigned().notNullable().references("aids.id");
    t.primary(["notice_id", "aid_id"]);
    t.index(["aid_id"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("notice_aids");
}
