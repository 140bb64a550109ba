import type { Knex } from "knex";

// Photos attached to a report. The original stays private; only the resized public copy and
// the thumbnail (both without metadata) are ever served.
export async function up(knex: Knex) {
  await knex.schema.createTable("report_photos", (t) => {
    t.string("id", 36).primary(); // the upload's UUID
    t.integer("report_id").unsigned().notNullable().references("reports.id").onDelete("CASCADE");
    t.integer("position").unsigned().notNullable();
    t.string("original_key", 200).notNullable();
    t.string("public_key", 200).notNullable();
    t.string("thumb_key", 200).notNullable();
    t.string("content_type", 40).notNullable(); // of the original
    t.integer("bytes").unsigned().notNullable();
    t.integer("width").unsigned().notNullable();
    t.integer("height").unsigned().notNullable();
    t.double("exif_lat").nullable();
    t.double("exif_lon").nullable();
    t.string("exif_taken_at", 40).nullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.index(["report_id", "position"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("report_photos");
}
