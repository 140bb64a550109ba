import type { Knex } from "knex";

export async function up(knex: Knex) {
  await knex.schema.createTable("notice_reports", (t) => {
    t.integer("notice_id").unsigned().notNullable().references("notices.id").onDelete("CASCADE");
    // No foreign key on purpose: the `reports` table belongs to the discrepancy-reports feature
    // and may be created by a later migration. A later migration may add the constraint.
    t.integer("report_id").unsigned().notNullable();
    t.primary(["notice_id", "report_id"]);
    t.index(["report_id"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("notice_reports");
}
