import type { Knex } from "knex";

// Discrepancy reports from boaters. The observation is kept as submitted (JSON, the same shape
// as an observation of POST /api/v1/assessments); the derived figures are stored beside it so
// the triage queue can sort by verdict without recomputing.
export async function up(knex: Knex) {
  await knex.schema.createTable("reports", (t) => {
    t.increments("id").primary();
    t.integer("harbour_id").unsigned().notNullable().references("harbours.id");
    t.integer("aid_id").unsigned().nullable().references("aids.id");
    t.string("hazard_description", 500).nullable(); // uncharted hazard (no aid)
    t.enum("observation_method", ["gnss", "radar", "compass"]).notNullable();
    t.text("observation_json", "longtext").notNullable();
    t.datetime("observed_at", { precision: 3 }).notNullable();
    t.text("remarks").nullable();
    t.integer("reporter_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.string("reporter_email", 254).notNullable();
    t.string("reporter_name", 120).nullable();
    t.string("reporter_vessel", 120).nullable();
    t.enum("status", ["new", "acknowledged", "confirmed", "not_confirmed", "duplicate", "closed"]).notNullable().defaultTo("new");
    t.enum("closed_reason", ["notice", "no_action"]).nullable();
    t.integer("duplicate_of_id").unsigned().nullable();
    t.integer("notice_id").unsigned().nullable(); // the notice drafted from / closing this report
    t.double("observed_lat").notNullable(); // WGS 84
    t.double("observed_lon").notNullable();
    t.double("uncertainty_m").notNullable(); // 95% radius of the observed position
    t.enum("verdict", ["within_swing_circle", "inconclusive", "off_station"]).nullable(); // null for hazards
    t.double("displacement_m").nullable();
    t.double("displacement_bearing_deg").nullable();
    t.text("assessment_json", "longtext").nullable();
    t.text("photo_flags_json").nullable(); // EXIF position/time mismatches with what was typed
    t.datetime("created_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.datetime("updated_at", { precision: 3 }).notNullable().defaultTo(knex.raw("CURRENT_TIMESTAMP(3)"));
    t.index(["status", "verdict", "created_at"]);
    t.index(["aid_id", "status"]);
    t.index(["reporter_user_id", "created_at"]);
  });
}

export async function down(knex: Knex) {
  await knex.schema.dropTable("reports");
}
