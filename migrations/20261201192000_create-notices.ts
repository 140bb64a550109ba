import type { Knex } from "knex";

// A local navigational warning. Codes for general type, detail types and restrictions are the
// IHO S-124 ones listed in app/lib/notices/vocabulary.ts (S-124 feature catalogue 1.5, 2024).
export async function up(knex: Knex) {
  await knex.schema.createTable("notices", (t) => {
    t.increments("id").primary();
    t.integer("harbour_id").unsigned().notNullable().references("harbours.id");
    // Series identifier, assigned at publication: "KSH 2026/014" = series_code year/number.
    t.string("series_code", 10).nullable();
    t.smallint("year").unsigned().nullable();
    t.integer("number").unsigned().nullable();
    t.string("title", 160).notNullable();
    t.string("general_type", 60).notNullable();
    t.text("detail_types").notNullable().defaultTo("[]"); // JSON array of S-124 detail codes
    t.text("restrictions").notNullable().defaultTo("[]"); // JSON array of S-124 restriction codes
    t.enum("urgency", ["urgent", "routine"]).notNullable().defaultTo("routine");
    t.enum("status", ["draft", "in_force", "expired", "cancelled", "superseded"]).notNullable().defaultTo("draft");
    // "REPORTED" unless the position is confirmed by survey ("LOCATED"), MSC.1/Circ.1310.
    t.enum("position_status", ["reported", "located"]).notNullable().defaultTo("reported");
    t.datetime("valid_from", { precision: 3 }).notNullable();
    t.datetime("valid_until", { precision: 3 }).nullable(); // null: until further notice
    t.string("general_area", 120).notNullable();
    t.string("locality", 160).notNullable();
    t.string("charts", 200).notNullable().defaultTo(""); // affected chart numbers, as written
    t.text("body").notNullable(); // amplifying remarks
    t.integer("supersedes_notice_id").unsigned().nullable().references("notices.id");
    t.integer("superseded_by_notice_id").unsigned().nullable().references("notices.id");
    t.string("related_refs", 200).notNullable().defaultTo(""); // related notices, as series numbers
    t.boolean("outside_boundary_accepted").notNullable().defaultTo(false);
    t.text("cancellation_reason").nullable();
    t.datetime("published_at", { precision: 3 }).nullable();
    t.datetime("cancelled_at", { precision: 3 }).nullable();
    t.datetime("expired_at", { precision: 3 }).nullable();
    t.integer("created_by").unsigned().nullable().references("users.id");
    t.integer("updated_by").unsigned().nullable().references("users.id");
    t.integer("published_by").unsigned().nullable().references("users.id");
    t.integer("version").unsigned().notNullable().defaultTo(1); // optimistic locking
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.datetime("updated_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.unique(["harbour_id", "year", "number"], { indexName: "notices_series_number_unique" });
    t.index(["status", "valid_until"], "notices_status_until");
    t.index(["updated_at", "id"], "notices_updated");
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("notices");
}
