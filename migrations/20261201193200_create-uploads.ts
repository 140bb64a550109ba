import type { Knex } from "knex";

// Photos stored in object storage but not yet attached to a report. A row exists BEFORE its
// objects are written, so anything in the bucket is either attached (report_photos) or listed
// here and removed by the worker's cleanup once expired.
export async function up(knex: Knex) {
  await knex.schema.createTable("uploads", (t) => {
    t.string("id", 36).primary(); // random UUID, also the object key stem
    t.enum("state", ["awaiting_put", "stored"]).notNullable(); // awaiting_put: presigned, not yet processed
    t.string("incoming_key", 200).nullable(); // presigned PUT target, raw bytes from the client
    t.string("original_key", 200).nullable();
    t.string("public_key", 200).nullable();
    t.string("thumb_key", 200).nullable();
    t.string("content_type", 40).nullable();
    t.integer("bytes").unsigned().nullable();
    t.integer("width").unsigned().nullable();
    t.integer("height").unsigned().nullable();
    t.double("exif_lat").nullable();
    t.double("exif_lon").nullable();
    t.string("exif_taken_at", 40).nullable(); // raw EXIF text with its offset, e.g. 2026:11:30 14:05:00+00:00
    t.integer("owner_user_id").unsigned().nullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.datetime("expires_at", { precision: 3 }).notNullable();
    t.index(["expires_at"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("uploads");
}
