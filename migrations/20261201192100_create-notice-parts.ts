import type { Knex } from "knex";

// Geometry parts of a notice (S-124 NAVWARNPart). The positions are kept exactly as entered
// with their CRS; geom is the WGS 84 geometry (X = longitude). A circle is stored as its
// centre in `centre_*` and `radius_nm`, and `geom` holds a polygon approximating it so bbox
// searches on the SPATIAL index find it by its whole extent.
export async function up(knex: Knex) {
  await knex.schema.createTable("notice_parts", (t) => {
    t.increments("id").primary();
    t.integer("notice_id").unsigned().notNullable().references("notices.id").onDelete("CASCADE");
    t.smallint("seq").unsigned().notNullable();
    t.enum("kind", ["point", "line", "area", "circle"]).notNullable();
    t.text("positions_text").notNullable(); // one position per line, exactly as entered
    t.string("crs", 20).notNullable(); // e.g. EPSG:4230
    t.decimal("radius_nm", 8, 3).nullable();
    t.text("coordinates_json").notNullable(); // WGS 84 [lon, lat] per entered position
    t.specificType("geom", "GEOMETRY REF_SYSTEM_ID=4326 NOT NULL");
    t.unique(["notice_id", "seq"]);
    t.index(["geom"], "notice_parts_geom_spatial", { indexType: "SPATIAL" });
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("notice_parts");
}
