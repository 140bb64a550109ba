import type { Knex } from "knex";

export async function up(knex: Knex) {
  await knex.schema.createTable("harbours", (t) => {
    t.increments("id").primary();
    t.string("slug", 60).notNullable().unique();
    t.string("name", 120).notNullable();
    t.string("authority_name", 160).notNullable();
    t.string("series_code", 10).notNullable().unique(); // e.g. KSH → "KSH 2026/014"
    t.string("general_area", 120).notNullable(); // the MSI "general area" line, e.g. NORTH SEA
    t.string("default_crs", 20).notNullable().defaultTo("EPSG:4326");
    t.string("time_zone", 60).notNullable();
    // Authority area (WGS 84, X = longitude). Axis order is always lon/lat in MariaDB.
    t.specificType("boundary", "GEOMETRY REF_SYSTEM_ID=4326 NOT NULL");
    // Offline base map: land, breakwaters, channel outlines as a GeoJSON FeatureCollection.
    t.text("basemap_geojson", "longtext").nullable();
    t.string("vhf_contact", 120).nullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.index(["boundary"], "harbours_boundary_spatial", { indexType: "SPATIAL" });
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("harbours");
}
