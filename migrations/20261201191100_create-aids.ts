import type { Knex } from "knex";

// IALA Maritime Buoyage System categories (IALA, summarised in ../shared/TRADE.md).
export const IALA_CATEGORIES = [
  "port",
  "starboard",
  "preferred_channel_port",
  "preferred_channel_starboard",
  "north_cardinal",
  "east_cardinal",
  "south_cardinal",
  "west_cardinal",
  "isolated_danger",
  "safe_water",
  "special",
  "emergency_wreck",
] as const;

export async function up(knex: Knex) {
  await knex.schema.createTable("aids", (t) => {
    t.increments("id").primary();
    t.integer("harbour_id").unsigned().notNullable().references("harbours.id");
    t.string("code", 30).notNullable(); // short name on the register, e.g. KS3
    t.string("name", 120).notNullable();
    t.enum("aid_type", ["buoy", "beacon", "light"]).notNullable();
    t.enum("iala_category", [...IALA_CATEGORIES]).nullable();
    t.enum("iala_region", ["A", "B"]).notNullable().defaultTo("A");
    t.string("light_characteristic", 60).nullable(); // as written on charts, e.g. Fl(2) R 10s
    t.string("charted_position_text", 120).notNullable(); // exactly as entered
    t.string("charted_crs", 20).notNullable();
    t.double("lat").notNullable(); // WGS 84, converted from the entered position
    t.double("lon").notNullable();
    t.specificType("geom", "GEOMETRY REF_SYSTEM_ID=4326 NOT NULL");
    t.decimal("chain_length_m", 7, 2).nullable();
    t.decimal("depth_m", 7, 2).nullable(); // at low water
    t.decimal("swing_radius_m", 7, 2).nullable(); // stated radius, used instead of the mooring
    t.enum("status", ["operating", "unlit", "damaged", "off_station", "missing", "withdrawn"]).notNullable().defaultTo("operating");
    t.text("remarks").nullable();
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.datetime("updated_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.unique(["harbour_id", "code"]);
    t.index(["geom"], "aids_geom_spatial", { indexType: "SPATIAL" });
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("aids");
}
