/**
 * One zod schema for an aid to navigation as typed in the register form or read from one CSV
 * row: text in, normalised values out (charted position converted to WGS 84, light
 * characteristic parsed). Pure: proj4 only, no I/O.
 */
import { z } from "zod";
import { toWgs84, type Coord } from "../geo/crs";
import { parseCrsCode } from "../geo/crs-registry";
import { isGeoInputError } from "../geo/errors";
import { parsePosition, parseProjectedPair } from "../geo/positions";
import { AID_STATUSES, AID_TYPES, IALA_CATEGORIES, IALA_CATEGORY_LABELS, characteristicWarning, type IalaCategory } from "./iala";
import { parseLightCharacteristic, type LightCharacteristic } from "./light";

/** CSV columns, in order, for import and export. */
export const AID_CSV_COLUMNS = [
  "code",
  "name",
  "aid_type",
  "iala_category",
  "iala_region",
  "light_characteristic",
  "charted_position",
  "charted_crs",
  "chain_length_m",
  "depth_m",
  "swing_radius_m",
  "status",
  "remarks",
] as const;

const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : typeof v === "string" ? v.trim() : v);

const optionalMetres = (label: string, max = 1000) =>
  z.preprocess(
    blankToUndefined,
    z.coerce
      .number({ error: `${label} must be a number of metres` })
      .min(0, { error: `${label} cannot be negative` })
      .max(max, { error: `${label} must be at most ${max} m` })
      .optional(),
  );

const categoryByLabel = new Map<string, IalaCategory>(
  IALA_CATEGORIES.flatMap((c) => [
    [c, c],
    [IALA_CATEGORY_LABELS[c].toLowerCase(), c],
  ]),
);

export interface NormalisedAid {
  code: string;
  name: string;
  aidType: (typeof AID_TYPES)[number];
  ialaCategory: IalaCategory | null;
  ialaRegion: "A" | "B";
  lightCharacteristic: string | null;
  light: LightCharacteristic | null;
  lightWarning: string | null;
  chartedPositionText: string;
  chartedCrs: string;
  lat: number;
  lon: number;
  chainLengthM: number | null;
  depthM: number | null;
  swingRadiusM: number | null;
  status: (typeof AID_STATUSES)[number];
  remarks: string | null;
}

export const aidInputSchema = z
  .object({
    code: z.preprocess(
      blankToUndefined,
      z
        .string({ error: "Give the aid's short name, e.g. KS3" })
        .max(30, { error: "At most 30 characters" })
        .regex(/^[A-Za-z0-9][A-Za-z0-9 ._/-]*$/, { error: "Letters, digits, space, . _ / - only, e.g. KS3 or GANNET-S" }),
    ),
    name: z.preprocess(blankToUndefined, z.string({ error: "Give the aid's name" }).max(120, { error: "At most 120 characters" })),
    aid_type: z.preprocess(
      (v) => (typeof v === "string" ? v.trim().toLowerCase() : v),
      z.enum(AID_TYPES, { error: "Type must be buoy, beacon or light" }),
    ),
    iala_category: z.preprocess(
      (v) => (typeof v === "string" ? v.trim().toLowerCase().replace(/-/g, "_") : v),
      z
        .string()
        .optional()
        .transform((v, ctx) => {
          if (!v) return null;
          const c = categoryByLabel.get(v) ?? categoryByLabel.get(v.replace(/_/g, " "));
          if (!c) {
            ctx.issues.push({ code: "custom", message: `Unknown IALA category "${v}": use one of ${IALA_CATEGORIES.join(", ")}`, input: v });
            return z.NEVER;
          }
          return c;
        }),
    ),
    iala_region: z.preprocess(
      (v) => (typeof v === "string" && v.trim() ? v.trim().toUpperCase() : "A"),
      z.enum(["A", "B"], { error: "IALA region must be A or B" }),
    ),
    light_characteristic: z.preprocess(blankToUndefined, z.string().max(60, { error: "At most 60 characters" }).optional()),
    charted_position: z.preprocess(
      blankToUndefined,
      z.string({ error: 'Give the charted position, e.g. 55°11.52′N 003°00.83′E' }).max(120, { error: "At most 120 characters" }),
    ),
    charted_crs: z.preprocess((v) => blankToUndefined(v) ?? "EPSG:4326", z.string().max(20)),
    chain_length_m: optionalMetres("Chain length"),
    depth_m: optionalMetres("Depth at low water"),
    swing_radius_m: optionalMetres("Swing radius", 5000),
    status: z.preprocess(
      (v) => (typeof v === "string" && v.trim() ? v.trim().toLowerCase().replace(/[ -]/g, "_") : "operating"),
      z.enum(AID_STATUSES, { error: `Status must be one of ${AID_STATUSES.join(", ")}` }),
    ),
    remarks: z.preprocess(blankToUndefined, z.string().max(2000, { error: "At most 2000 characters" }).optional()),
  })
  .transform((v, ctx): NormalisedAid => {
    const before = ctx.issues.length;
    const issue = (path: string, message: string) => ctx.issues.push({ code: "custom", message, path: [path], input: undefined });

    let light: LightCharacteristic | null = null;
    if (v.light_characteristic) {
      const r = parseLightCharacteristic(v.light_characteristic);
      if (r.ok) light = r.value;
      else issue("light_characteristic", r.error);
    } else if (v.aid_type === "light") {
      issue("light_characteristic", "A light needs its characteristic, e.g. Oc G 6s");
    }

    let lat = 0;
    let lon = 0;
    const crs = parseCrsCode(v.charted_crs);
    if (!crs.ok) issue("charted_crs", crs.error);
    else {
      let coord: Coord | null = null;
      if (crs.crs.kind === "geographic") {
        const p = parsePosition(v.charted_position);
        if (p.ok) coord = { lat: p.lat, lon: p.lon };
        else issue("charted_position", p.error);
      } else {
        const p = parseProjectedPair(v.charted_position);
        if (p.ok) coord = { easting: p.easting, northing: p.northing };
        else issue("charted_position", `${p.error} (${crs.crs.id} is a grid: give "easting northing" in metres)`);
      }
      if (coord) {
        try {
          const w = toWgs84(crs.crs, coord, { field: "charted_position" });
          lat = w.lat;
          lon = w.lon;
        } catch (e) {
          if (isGeoInputError(e)) issue("charted_position", e.message);
          else throw e;
        }
      }
    }

    const chain = v.chain_length_m ?? null;
    const depth = v.depth_m ?? null;
    const swing = v.swing_radius_m ?? null;
    if ((chain === null) !== (depth === null)) {
      issue(chain === null ? "chain_length_m" : "depth_m", "Give both the chain length and the depth at low water, or neither");
    } else if (chain !== null && depth !== null && depth >= chain) {
      issue("depth_m", `The depth (${depth} m) must be less than the chain length (${chain} m)`);
    }
    if (chain === null && swing === null) {
      issue("swing_radius_m", v.aid_type === "buoy" ? "Give the mooring (chain length and depth) or a stated swing radius" : "Give a swing radius (0 for a fixed structure)");
    }
    if (ctx.issues.length > before) return z.NEVER;
    return {
      code: v.code,
      name: v.name,
      aidType: v.aid_type,
      ialaCategory: v.iala_category,
      ialaRegion: v.iala_region,
      lightCharacteristic: light?.text ?? null,
      light,
      lightWarning: characteristicWarning(v.iala_category, v.iala_region, light),
      chartedPositionText: v.charted_position,
      chartedCrs: crs.ok ? crs.crs.id : v.charted_crs,
      lat,
      lon,
      chainLengthM: chain,
      depthM: depth,
      swingRadiusM: swing,
      status: v.status,
      remarks: v.remarks ?? null,
    };
  });

export type AidInput = z.input<typeof aidInputSchema>;

/** Swing radius from a stated radius, or the taut-chain excursion √(L² − d²) (geometry; TRADE.md). */
export function swingRadiusOf(a: { swingRadiusM: number | null; chainLengthM: number | null; depthM: number | null }): number | null {
  if (a.swingRadiusM !== null) return a.swingRadiusM;
  if (a.chainLengthM !== null && a.depthM !== null && a.depthM < a.chainLengthM) return Math.sqrt(a.chainLengthM ** 2 - a.depthM ** 2);
  return null;
}

export interface CsvRowResult {
  line: number;
  ok: boolean;
  value?: NormalisedAid;
  errors?: { column: string; message: string }[];
}

/** Checks CSV header names: all required columns present, no unknown ones. */
export function checkCsvHeader(header: string[]): string | null {
  const cols = header.map((h) => h.trim().toLowerCase());
  const unknown = cols.filter((c) => !(AID_CSV_COLUMNS as readonly string[]).includes(c));
  if (unknown.length) return `Unknown column${unknown.length > 1 ? "s" : ""}: ${unknown.join(", ")}. Expected: ${AID_CSV_COLUMNS.join(", ")}`;
  const missing = ["code", "name", "aid_type", "charted_position"].filter((c) => !cols.includes(c));
  if (missing.length) return `Missing column${missing.length > 1 ? "s" : ""}: ${missing.join(", ")}`;
  const dup = cols.find((c, i) => cols.indexOf(c) !== i);
  if (dup) return `Column ${dup} appears twice`;
  return null;
}

/** Validates parsed CSV records (objects keyed by header); line numbers count the header as line 1. */
export function validateCsvRows(records: Record<string, string>[]): CsvRowResult[] {
  const seen = new Map<string, number>();
  return records.map((rec, i) => {
    const line = i + 2;
    const r = aidInputSchema.safeParse(rec);
    if (!r.success) {
      return { line, ok: false, errors: r.error.issues.map((iss) => ({ column: String(iss.path[0] ?? "row"), message: iss.message })) };
    }
    const key = r.data.code.toUpperCase();
    const first = seen.get(key);
    if (first) return { line, ok: false, errors: [{ column: "code", message: `Code ${r.data.code} is already used on line ${first}` }] };
    seen.set(key, line);
    return { line, ok: true, value: r.data };
  });
}
