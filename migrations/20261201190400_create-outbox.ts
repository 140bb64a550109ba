import type { Knex } from "knex";

export async function up(knex: Knex) {
  await knex.schema.createTable("outbox", (t) => {
    t.bigIncrements("id").primary();
    t.string("idempotency_key", 191).notNullable().unique();
    t.string("kind", 40).notNullable();
    t.string("to_address", 254).notNullable();
    t.string("subject", 300).notNullable();
    t.text("body_text", "mediumtext").notNullable();
    t.text("body_html", "mediumtext").nullable();
    t.text("headers").notNullable();
    t.enum("status", ["queued", "sending", "sent", "failed"]).notNullable().defaultTo("queued");
    t.integer("attempts").notNullable().defaultTo(0);
    t.datetime("run_at", { precision: 3 }).notNullable();
    t.string("locked_by", 100).nullable();
    t.datetime("locked_until", { precision: 3 }).nullable();
    t.text("last_error").nullable();
    t.datetime("sent_at", { precision: 3 }).nullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.index(["status", "run_at", "id"]);
    t.index(["kind", "status"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("outbox");
}
