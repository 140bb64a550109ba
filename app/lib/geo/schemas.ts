/**
 * zod schemas shared by the JSON API and the forms: the body of POST /api/v1/assessments and
 * the query strings of GET /api/v1/convert and GET /api/v1/measure. They validate everything
 * (including position text, CRS codes, transformations and magnetic-model dates) so each
 * error names its field path, and output normalised numbers for the engine.
 *
 * Browser-safe: imports positions and the CRS registry only (no proj4, no geomagnetism).
 */
import { z } from "zod";
import { type CrsDefinition, type DatumTransformation, parseCrsCode, resolveTransformation } from "./crs-registry";
import type { Coord } from "./crs";
import { MAGNETIC_MODEL_END_MS, MAGNETIC_MODEL_START_MS } from "./magnetic-window";
import type { Observation } from "./observation";
import { MAX_POSITION_TEXT_LENGTH, parsePosition, parseProjectedPair } from "./positions";

const POSITION_HINT = 'Give a position as text, e.g. "55°12.30′N 003°01.10′E", or as { "lat": …, "lon": … }';

const positionInput = z.union(
  [
    z.string().max(MAX_POSITION_TEXT_LENGTH, { error: "This position is too long" }),
    z.object({ lat: z.number(), lon: z.number() }).strict(),
    z.object({ easting: z.number(), northing: z.number() }).strict(),
  ],
  { error: POSITION_HINT },
);

const metres = (name: string, max = 100_000) =>
  z
    .number({ error: `${name} must be a number of metres` })
    .min(0, { error: `${name} cannot be negative` })
    .max(max, { error: `${name} must be at most ${max.toLocaleString("en")} m` });

const positiveMetres = (name: string, max = 100_000) =>
  z
    .number({ error: `${name} must be a number of metres` })
    .positive({ error: `${name} must be greater than 0` })
    .max(max, { error: `${name} must be at most ${max.toLocaleString("en")} m` });

const bearing = (name: string) =>
  z
    .number({ error: `${name} must be a number of degrees` })
    .min(0, { error: `${name} must be from 0 to 360°` })
    .max(360, { error: `${name} must be from 0 to 360°` });

const nauticalMiles = (name: string) =>
  z
    .number({ error: `${name} must be a number of nautical miles` })
    .positive({ error: `${name} must be greater than 0` })
    .max(100, { error: `${name} must be at most 100 M` });

const observedAt = z.iso.datetime({
  offset: true,
  error: "observedAt must be an ISO 8601 date-time with a time zone, e.g. 2026-11-20T14:05:00Z",
});

const gnssSchema = z
  .object({
    method: z.literal("gnss"),
    position: positionInput,
    observedAt: observedAt.optional(),
    accuracyM: positiveMetres("accuracyM", 10_000).optional(),
    offsetM: metres("offsetM", 10_000).optional(),
  })
  .strict();

const radarSchema = z
  .object({
    method: z.literal("radar"),
    ownPosition: positionInput,
    rangeNm: nauticalMiles("rangeNm"),
    bearingDeg: bearing("bearingDeg"),
    bearingRef: z.enum(["true", "relative"], { error: 'bearingRef must be "true" or "relative"' }).default("true"),
    headingTrueDeg: bearing("headingTrueDeg").optional(),
    rangeScaleNm: nauticalMiles("rangeScaleNm"),
    ownAccuracyM: positiveMetres("ownAccuracyM", 10_000).optional(),
    observedAt: observedAt.optional(),
  })
  .strict();

const compassSchema = z
  .object({
    method: z.literal("compass"),
    ownPosition: positionInput,
    bearingMagneticDeg: bearing("bearingMagneticDeg"),
    distanceM: positiveMetres("distanceM", 50_000),
    distanceUncertaintyM: positiveMetres("distanceUncertaintyM", 50_000).optional(),
    ownAccuracyM: positiveMetres("ownAccuracyM", 10_000).optional(),
    observedAt: z.iso.datetime({
      offset: true,
      error: (iss) =>
        iss.input === undefined
          ? "Give observedAt, the date and time of the bearing: magnetic variation depends on it"
          : "observedAt must be an ISO 8601 date-time with a time zone, e.g. 2026-11-20T14:05:00Z",
    }),
  })
  .strict();

const observationSchema = z.discriminatedUnion("method", [gnssSchema, radarSchema, compassSchema], {
  error: 'method must be "gnss", "radar" or "compass"',
});

const chartedSchema = z
  .object({
    position: positionInput,
    crs: z.string().max(60).optional(),
    transformation: z.string().max(60).optional(),
    /** Extra 95% uncertainty of the charted position itself (e.g. chart compilation), metres. */
    uncertaintyM: metres("uncertaintyM").optional(),
  })
  .strict();

export interface NormalisedCharted {
  coord: Coord;
  crs: CrsDefinition;
  transformation: DatumTransformation;
  uncertaintyM: number;
}

export interface NormalisedSwing {
  radiusM: number;
  source: "stated" | "mooring";
  chainLengthM?: number;
  depthM?: number;
}

export interface NormalisedAssessmentInput {
  charted: NormalisedCharted;
  swing: NormalisedSwing;
  observations: Observation[];
}

type Ctx = z.core.$RefinementCtx<unknown>;
type Path = (string | number)[];

function issue(ctx: Ctx, path: Path, message: string): void {
  ctx.issues.push({ code: "custom", message, path, input: undefined });
}

/** A WGS 84 position from text or { lat, lon }; reports an issue and returns null on failure. */
function wgs84Position(v: z.infer<typeof positionInput>, ctx: Ctx, path: Path): { lat: number; lon: number } | null {
  if (typeof v === "string") {
    const r = parsePosition(v);
    if (!r.ok) {
      issue(ctx, path, r.error);
      return null;
    }
    return { lat: r.lat, lon: r.lon };
  }
  if ("lat" in v) {
    if (Math.abs(v.lat) > 90) return issue(ctx, path, `Latitude ${v.lat}° is beyond 90°`), null;
    if (Math.abs(v.lon) > 180) return issue(ctx, path, `Longitude ${v.lon}° is beyond 180°`), null;
    return { lat: v.lat + 0, lon: v.lon + 0 };
  }
  issue(ctx, path, "This position is WGS 84: give a latitude and longitude, not an easting and northing");
  return null;
}

function coordInCrs(v: z.infer<typeof positionInput>, crs: CrsDefinition, ctx: Ctx, path: Path): Coord | null {
  if (crs.kind === "geographic") return wgs84Position(v, ctx, path);
  if (typeof v === "string") {
    const r = parseProjectedPair(v);
    if (!r.ok) return issue(ctx, path, `${r.error} (${crs.id} is projected: give "easting northing" in metres)`), null;
    return { easting: r.easting, northing: r.northing };
  }
  if ("easting" in v) return { easting: v.easting, northing: v.northing };
  issue(ctx, path, `${crs.id} is projected: give an easting and northing in metres`);
  return null;
}

function dateOf(s: string | undefined): Date | undefined {
  return s === undefined ? undefined : new Date(s);
}

export const assessmentInputSchema = z
  .object({
    charted: chartedSchema,
    swingRadiusM: metres("swingRadiusM", 10_000).optional(),
    mooring: z
      .object({
        chainLengthM: positiveMetres("chainLengthM", 10_000),
        depthM: metres("depthM", 10_000),
      })
      .strict()
      .optional(),
    observations: z
      .array(observationSchema, { error: "observations must be a list" })
      .min(1, { error: "Give at least one observation" })
      .max(20, { error: "At most 20 observations per assessment" }),
  })
  .strict()
  .transform((v, ctx): NormalisedAssessmentInput => {
    const before = ctx.issues.length;

    // Charted position in its CRS.
    const crsText = v.charted.crs ?? "EPSG:4326";
    const crsR = parseCrsCode(crsText);
    let charted: NormalisedCharted | null = null;
    if (!crsR.ok) issue(ctx, ["charted", "crs"], crsR.error);
    else {
      const tr = resolveTransformation(crsR.crs.datum, v.charted.transformation);
      if (!tr.ok) issue(ctx, ["charted", "transformation"], tr.error);
      const coord = coordInCrs(v.charted.position, crsR.crs, ctx, ["charted", "position"]);
      if (tr.ok && coord) {
        charted = { coord, crs: crsR.crs, transformation: tr.transformation, uncertaintyM: v.charted.uncertaintyM ?? 0 };
      }
    }

    // Swing radius: stated, or from the mooring.
    let swing: NormalisedSwing | null = null;
    if (v.swingRadiusM !== undefined && v.mooring) {
      issue(ctx, ["mooring"], "Give either swingRadiusM or mooring (chainLengthM and depthM), not both");
    } else if (v.swingRadiusM !== undefined) {
      swing = { radiusM: v.swingRadiusM, source: "stated" };
    } else if (v.mooring) {
      const { chainLengthM: L, depthM: d } = v.mooring;
      if (d >= L) {
        issue(
          ctx,
          ["mooring", "depthM"],
          `The depth (${d} m) must be less than the chain length (${L} m): with that chain the buoy could not swing at all`,
        );
      } else {
        swing = { radiusM: Math.sqrt(L * L - d * d), source: "mooring", chainLengthM: L, depthM: d };
      }
    } else {
      issue(ctx, ["swingRadiusM"], "Give the aid's swingRadiusM, or its mooring (chainLengthM and depthM at low water)");
    }

    // Observations.
    const observations: Observation[] = [];
    v.observations.forEach((o, i) => {
      const at = ["observations", i] as Path;
      if (o.method === "gnss") {
        const p = wgs84Position(o.position, ctx, [...at, "position"]);
        if (p) observations.push({ method: "gnss", lat: p.lat, lon: p.lon, accuracyM: o.accuracyM, offsetM: o.offsetM, observedAt: dateOf(o.observedAt) });
        return;
      }
      const own = wgs84Position(o.ownPosition, ctx, [...at, "ownPosition"]);
      if (o.method === "radar") {
        let ok = own !== null;
        if (o.bearingRef === "relative" && o.headingTrueDeg === undefined) {
          issue(ctx, [...at, "headingTrueDeg"], "A relative bearing needs the ship's heading: give headingTrueDeg");
          ok = false;
        }
        if (o.rangeNm > o.rangeScaleNm) {
          issue(ctx, [...at, "rangeNm"], `The range (${o.rangeNm} M) is beyond the range scale in use (${o.rangeScaleNm} M)`);
          ok = false;
        }
        if (ok && own) {
          observations.push({
            method: "radar",
            ownLat: own.lat,
            ownLon: own.lon,
            rangeNm: o.rangeNm,
            bearingDeg: o.bearingDeg,
            bearingRef: o.bearingRef,
            headingTrueDeg: o.headingTrueDeg,
            rangeScaleNm: o.rangeScaleNm,
            ownAccuracyM: o.ownAccuracyM,
            observedAt: dateOf(o.observedAt),
          });
        }
        return;
      }
      const when = new Date(o.observedAt);
      const t = when.getTime();
      if (t < MAGNETIC_MODEL_START_MS || t >= MAGNETIC_MODEL_END_MS) {
        issue(
          ctx,
          [...at, "observedAt"],
          t >= MAGNETIC_MODEL_END_MS
            ? `${o.observedAt.slice(0, 10)} is after the World Magnetic Model 2025 validity (to 2030-01-01): the magnetic bearing cannot be converted to true`
            : `${o.observedAt.slice(0, 10)} is before 2020-01-01, the earliest date the magnetic models cover`,
        );
        return;
      }
      if (own) {
        observations.push({
          method: "compass",
          ownLat: own.lat,
          ownLon: own.lon,
          bearingMagneticDeg: o.bearingMagneticDeg,
          distanceM: o.distanceM,
          distanceUncertaintyM: o.distanceUncertaintyM,
          ownAccuracyM: o.ownAccuracyM,
          observedAt: when,
        });
      }
    });

    if (ctx.issues.length > before || !charted || !swing) return z.NEVER;
    return { charted, swing, observations };
  });

export type AssessmentInput = z.input<typeof assessmentInputSchema>;

// ---------------------------------------------------------------------------------------------
// Query strings for GET /api/v1/convert and GET /api/v1/measure

export interface NormalisedConvertQuery {
  from: CrsDefinition;
  to: CrsDefinition;
  fromTransformation: DatumTransformation;
  toTransformation: DatumTransformation;
  coord: Coord;
}

const queryText = (name: string, max = MAX_POSITION_TEXT_LENGTH) =>
  z.string({ error: `Give ${name}` }).max(max, { error: `${name} is too long` });

export const convertQuerySchema = z
  .object({
    from: queryText("from", 60).default("EPSG:4326"),
    to: queryText("to", 60).default("EPSG:4326"),
    position: queryText("position"),
    fromTransformation: z.string().max(60).optional(),
    toTransformation: z.string().max(60).optional(),
  })
  .transform((v, ctx): NormalisedConvertQuery => {
    const before = ctx.issues.length;
    const f = parseCrsCode(v.from || "EPSG:4326");
    const t = parseCrsCode(v.to || "EPSG:4326");
    if (!f.ok) issue(ctx, ["from"], f.error);
    if (!t.ok) issue(ctx, ["to"], t.error);
    let ft: DatumTransformation | null = null;
    let tt: DatumTransformation | null = null;
    let coord: Coord | null = null;
    if (f.ok) {
      const r = resolveTransformation(f.crs.datum, v.fromTransformation);
      if (r.ok) ft = r.transformation;
      else issue(ctx, ["fromTransformation"], r.error);
      coord = coordInCrs(v.position, f.crs, ctx, ["position"]);
    }
    if (t.ok) {
      const r = resolveTransformation(t.crs.datum, v.toTransformation);
      if (r.ok) tt = r.transformation;
      else issue(ctx, ["toTransformation"], r.error);
    }
    if (ctx.issues.length > before || !f.ok || !t.ok || !ft || !tt || !coord) return z.NEVER;
    return { from: f.crs, to: t.crs, fromTransformation: ft, toTransformation: tt, coord };
  });

export const measureQuerySchema = z
  .object({ from: queryText("from"), to: queryText("to") })
  .transform((v, ctx) => {
    const a = wgs84Position(v.from, ctx, ["from"]);
    const b = wgs84Position(v.to, ctx, ["to"]);
    if (!a || !b) return z.NEVER;
    return { from: a, to: b };
  });

// ---------------------------------------------------------------------------------------------
// Errors as { error, field }

export interface FieldError {
  error: string;
  field: string;
}

const DEFAULT_MESSAGE = /^(Invalid|Too (small|big)|Unrecognized|Expected)/;

/** The first problem in a ZodError as { error, field } (field is the dotted path, "" for the whole body). */
export function firstFieldError(err: z.ZodError): FieldError {
  const i = err.issues[0];
  if (!i) return { error: "Invalid input", field: "" };
  const field = i.path.map(String).join(".");
  let message = i.message;
  if (i.code === "unrecognized_keys") {
    const keys = (i as { keys?: string[] }).keys ?? [];
    return { error: `Unknown field${keys.length > 1 ? "s" : ""}: ${keys.join(", ")}`, field: [field, keys[0]].filter(Boolean).join(".") };
  }
  if (i.code === "invalid_type" && /received undefined/.test(message)) {
    message = `${field || "value"} is required`;
  } else if (DEFAULT_MESSAGE.test(message) && field) {
    message = `${field}: ${message}`;
  }
  return { error: message, field };
}

/** All problems, for forms that show every message beside its field. */
export function fieldErrors(err: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  for (const i of err.issues) {
    const f = firstFieldError(new z.ZodError([i]));
    if (!(f.field in out)) out[f.field] = f.error;
  }
  return out;
}
