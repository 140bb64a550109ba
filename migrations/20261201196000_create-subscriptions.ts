import type { Knex } from "knex";

// E-mail subscriptions to a harbour's notices: an area of interest, the notice types wanted,
// urgent alerts and/or a digest at a local time. `area` is the prefilter geometry for the
// spatial index (for circles, a polygon circumscribing the circle); the exact check uses
// area_geojson / centre + radius in app/lib/subscriptions/matching.ts.
export async function up(knex: Knex) {
  await knex.schema.createTable("subscriptions", (t) => {
    t.increments("id").primary();
    t.string("email", 254).notNullable();
    t.integer("user_id").unsigned().nullable().references("id").inTable("users").onDelete("SET NULL");
    t.integer("harbour_id").unsigned().notNullable().references("id").inTable("harbours").onDelete("CASCADE");
    t.enum("area_kind", ["harbour", "circle", "polygon"]).notNullable();
    t.specificType("area", "GEOMETRY REF_SYSTEM_ID=4326 NOT NULL");
    // Exact area: polygon ring as GeoJSON (lon, lat); null for the whole harbour and circles.
    t.text("area_geojson", "mediumtext").nullable();
    t.double("centre_lat").nullable();
    t.double("centre_lon").nullable();
    t.double("radius_nm").nullable();
    // The area as the subscriber typed it (positions as text), to refill the manage form.
    t.text("area_text").nullable();
    // JSON array of notice general types; an empty array means every type.
    t.text("general_types").notNullable();
    t.boolean("urgent_alerts").notNullable().defaultTo(true);
    t.enum("digest_cadence", ["none", "daily", "weekly"]).notNullable().defaultTo("none");
    t.string("digest_local_time", 5).nullable(); // HH:MM in the harbour's time zone
    t.tinyint("digest_weekday").unsigned().nullable(); // ISO 1 = Monday … 7 = Sunday
    t.enum("status", ["pending", "confirmed", "ended"]).notNullable().defaultTo("pending");
    t.string("label", 120).nullable(); // e.g. "Kestrel Sound Yacht Club" (optional)
    t.datetime("confirmed_at", { precision: 3 }).nullable();
    t.datetime("ended_at", { precision: 3 }).nullable();
    t.string("ended_reason", 40).nullable(); // unsubscribed | lapsed | replaced
    // End of the window the last digest covered; the next digest starts there.
    t.datetime("last_digest_at", { precision: 3 }).nullable();
    // When the next digest is due (UTC), computed from the local time in the harbour's zone.
    t.datetime("next_digest_at", { precision: 3 }).nullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.datetime("updated_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.index(["area"], "subscriptions_area_spatial", { indexType: "SPATIAL" });
    t.index(["email"]);
    t.index(["user_id"]);
    t.index(["status", "next_digest_at"]);
    t.index(["status", "created_at"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("subscriptions");
}
