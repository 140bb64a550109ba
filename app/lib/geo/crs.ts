/**
 * Coordinate conversion between the CRSs in crs-registry.ts, with proj4.
 *
 * proj4 traps handled here (STACK.md "Numerical traps"):
 * - Ellipsoids are passed as +a/+rf, never +ellps names (an unknown +ellps is silently WGS 84).
 * - +towgs84 is source → WGS 84 in the Position Vector convention (see crs-registry.ts).
 * - Only horizontal positions are converted; heights are not carried (proj4 passes the input
 *   height through unchanged for geographic → geographic, which would be wrong with a datum
 *   shift).
 *
 * Converters are built once and cached: one per datum transformation (datum → WGS 84) and one
 * per projected CRS (its projection on its own datum).
 */
import proj4 from "proj4";
import { GeoInputError } from "./errors";
import {
  ELLIPSOIDS,
  type CrsDefinition,
  type DatumTransformation,
  getCrs,
  getDatum,
  parseCrsCode,
  resolveTransformation,
  toPositionVector,
} from "./crs-registry";

export type GeographicCoord = { lat: number; lon: number };
export type ProjectedCoord = { easting: number; northing: number };
export type Coord = GeographicCoord | ProjectedCoord;

export type CrsInput = number | string | CrsDefinition;

export function isGeographicCoord(c: Coord): c is GeographicCoord {
  return (c as GeographicCoord).lat !== undefined;
}

/** Look up a CRS by EPSG number, "EPSG:xxxx" text or definition; throws GeoInputError. */
const crsMemo = new Map<string | number, CrsDefinition>();

export function resolveCrs(crs: CrsInput, field = "crs"): CrsDefinition {
  if (typeof crs === "object") return crs;
  const hit = crsMemo.get(crs);
  if (hit) return hit;
  const r = parseCrsCode(String(crs));
  if (!r.ok) throw new GeoInputError(r.error, field, "unsupported_crs");
  if (crsMemo.size < 1000) crsMemo.set(crs, r.crs);
  return r.crs;
}

/** The proj4 definition string for a CRS with a chosen transformation to WGS 84. */
export function proj4Definition(crs: CrsDefinition, transformation: DatumTransformation): string {
  const datum = getDatum(crs.datum);
  const e = ELLIPSOIDS[datum.ellipsoid];
  // The +towgs84 values below come from the transformation record, which names its EPSG code
  // (e.g. EPSG:1314 for OSGB36) — see crs-registry.ts.
  const towgs84 = toPositionVector(transformation).join(",");
  const base = crs.kind === "geographic" ? "+proj=longlat" : crs.projection!;
  return `${base} +a=${e.a} +rf=${e.rf} +towgs84=${towgs84} +no_defs`;
}

type Converter = proj4.Converter;
const converterCache = new Map<string, Converter>();
const WGS84_DEF = `+proj=longlat +a=${ELLIPSOIDS.wgs84.a} +rf=${ELLIPSOIDS.wgs84.rf} +towgs84=0,0,0 +no_defs`;

const transformationMemo = new Map<string, DatumTransformation>();

function transformationFor(crs: CrsDefinition, id: string | undefined, field: string): DatumTransformation {
  const key = `${crs.datum}|${id ?? ""}`;
  const hit = transformationMemo.get(key);
  if (hit) return hit;
  const r = resolveTransformation(crs.datum, id);
  if (!r.ok) throw new GeoInputError(r.error, field, "unknown_transformation");
  if (transformationMemo.size < 1000) transformationMemo.set(key, r.transformation);
  return r.transformation;
}

function cached(key: string, make: () => Converter): Converter {
  let c = converterCache.get(key);
  if (!c) {
    c = make();
    converterCache.set(key, c);
  }
  return c;
}

/** The CRS's own geographic CRS (same datum and transformation). */
function geographicDef(crs: CrsDefinition, t: DatumTransformation): string {
  return proj4Definition({ ...crs, kind: "geographic", projection: undefined }, t);
}

/** Datum shift: the CRS's geographic datum → WGS 84 (cached per datum and transformation). */
function datumConverter(crs: CrsDefinition, t: DatumTransformation): Converter {
  return cached(`datum|${crs.datum}|${t.id}`, () => proj4(geographicDef(crs, t), WGS84_DEF));
}

/**
 * Projection only: geographic → grid on the CRS's own ellipsoid (cached per CRS). Both sides
 * are written without +towgs84: with it, proj4 routes even identical datums through
 * geocentric coordinates and a round trip drifts by millimetres.
 */
function projectionConverter(crs: CrsDefinition): Converter {
  return cached(`proj|${crs.code}`, () => {
    const e = ELLIPSOIDS[getDatum(crs.datum).ellipsoid];
    const ell = `+a=${e.a} +rf=${e.rf}`;
    return proj4(`+proj=longlat ${ell} +no_defs`, `${crs.projection!} ${ell} +no_defs`);
  });
}

function isIdentity(t: DatumTransformation): boolean {
  return t.id === "identity";
}

/**
 * WGS 84 → the datum, as the inverse of the datum → WGS 84 shift at zero ellipsoidal height.
 * proj4's own inverse starts from zero height on WGS 84 instead, so a round trip drifts by
 * 1–2 mm. One fixed-point step removes that: the shift's dependence on position is ~1e-5 per
 * unit, so the remaining error is ~1e-13° (micrometres).
 */
function inverseDatumShift(conv: Converter, lon: number, lat: number): [number, number] {
  const first = conv.inverse([lon, lat]) as number[];
  const f = conv.forward(first) as number[];
  return [first[0]! + (lon - f[0]!), first[1]! + (lat - f[1]!)];
}

/** Number of cached converters (for the benchmark and tests). */
export function cachedConverterCount(): number {
  return converterCache.size;
}

function checkGeographic(c: GeographicCoord, field: string): void {
  if (!Number.isFinite(c.lat) || !Number.isFinite(c.lon) || Math.abs(c.lat) > 90 || Math.abs(c.lon) > 180) {
    throw new GeoInputError("Latitude must be within ±90° and longitude within ±180°", field, "out_of_range");
  }
}

function checkCoordKind(crs: CrsDefinition, coord: Coord, field: string): void {
  const geographic = isGeographicCoord(coord);
  if (crs.kind === "geographic" && !geographic) {
    throw new GeoInputError(`${crs.id} is geographic: give a latitude and longitude`, field, "wrong_coordinate_kind");
  }
  if (crs.kind === "projected" && geographic) {
    throw new GeoInputError(`${crs.id} is projected: give an easting and northing in metres`, field, "wrong_coordinate_kind");
  }
  if (geographic) checkGeographic(coord, field);
  else if (!Number.isFinite(coord.easting) || !Number.isFinite(coord.northing)) {
    throw new GeoInputError("Easting and northing must be numbers", field, "out_of_range");
  }
}

function finite(xy: number[], crs: CrsDefinition, field: string): void {
  if (!Number.isFinite(xy[0]) || !Number.isFinite(xy[1])) {
    throw new GeoInputError(`This position cannot be expressed in ${crs.id}`, field, "not_representable");
  }
}

export interface ConvertOptions {
  /** Transformation id for the source CRS's datum (default: the datum's documented default). */
  fromTransformation?: string;
  /** Transformation id for the target CRS's datum. */
  toTransformation?: string;
  /** Field path to report errors against. */
  field?: string;
}

/** Convert a coordinate in `crs` to WGS 84 latitude/longitude. */
export function toWgs84(crs: CrsInput, coord: Coord, options: { transformation?: string; field?: string } = {}): GeographicCoord {
  const field = options.field ?? "position";
  const def = resolveCrs(crs, "crs");
  checkCoordKind(def, coord, field);
  const t = transformationFor(def, options.transformation, "transformation");
  if (def.datum === "WGS84" && def.kind === "geographic") {
    const g = coord as GeographicCoord;
    return { lat: g.lat, lon: g.lon };
  }
  let geog: number[] = isGeographicCoord(coord) ? [coord.lon, coord.lat] : [coord.easting, coord.northing];
  if (def.kind === "projected") {
    geog = projectionConverter(def).inverse(geog) as number[];
    finite(geog, def, field);
  }
  const out = isIdentity(t) ? geog : (datumConverter(def, t).forward(geog) as number[]);
  finite(out, def, field);
  return { lat: out[1]!, lon: normaliseLon(out[0]!) };
}

/** Convert WGS 84 latitude/longitude into `crs`. */
export function fromWgs84(crs: CrsInput, lat: number, lon: number, options: { transformation?: string; field?: string } = {}): Coord {
  const field = options.field ?? "position";
  const def = resolveCrs(crs, "crs");
  checkGeographic({ lat, lon }, field);
  const t = transformationFor(def, options.transformation, "transformation");
  if (def.datum === "WGS84" && def.kind === "geographic") return { lat, lon };
  const geog = isIdentity(t) ? [lon, lat] : inverseDatumShift(datumConverter(def, t), lon, lat);
  finite(geog, def, field);
  if (def.kind === "geographic") return { lat: geog[1]!, lon: normaliseLon(geog[0]!) };
  const out = projectionConverter(def).forward(geog) as number[];
  finite(out, def, field);
  return { easting: out[0]!, northing: out[1]! };
}

/** Convert between any two supported CRSs (through WGS 84 with the chosen transformations). */
export function convert(from: CrsInput, to: CrsInput, coord: Coord, options: ConvertOptions = {}): Coord {
  const field = options.field ?? "position";
  const f = resolveCrs(from, "from");
  const t = resolveCrs(to, "to");
  const ft = transformationFor(f, options.fromTransformation, "fromTransformation");
  const tt = transformationFor(t, options.toTransformation, "toTransformation");
  if (f.datum === t.datum && ft.id === tt.id) {
    // Same datum: a projection (or none) only, no datum shift.
    checkCoordKind(f, coord, field);
    let geog: number[] = isGeographicCoord(coord) ? [coord.lon, coord.lat] : (projectionConverter(f).inverse([coord.easting, coord.northing]) as number[]);
    finite(geog, f, field);
    geog = [normaliseLon(geog[0]!), geog[1]!];
    if (t.kind === "geographic") return { lat: geog[1]!, lon: geog[0]! };
    const out = projectionConverter(t).forward(geog) as number[];
    finite(out, t, field);
    return { easting: out[0]!, northing: out[1]! };
  }
  const g = toWgs84(f, coord, { transformation: ft.id, field });
  return fromWgs84(t, g.lat, g.lon, { transformation: tt.id, field });
}

/**
 * The transformations a conversion uses and their combined stated accuracy (root sum of
 * squares of the EPSG accuracies of each datum shift; 0 when both are WGS 84).
 */
export function conversionInfo(from: CrsInput, to: CrsInput, options: ConvertOptions = {}) {
  const f = resolveCrs(from, "from");
  const t = resolveCrs(to, "to");
  const ft = transformationFor(f, options.fromTransformation, "fromTransformation");
  const tt = transformationFor(t, options.toTransformation, "toTransformation");
  const sameDatum = f.datum === t.datum && ft.id === tt.id;
  const used = sameDatum ? [] : [ft, tt].filter((x) => x.id !== "identity");
  const accuracyM = Math.sqrt(used.reduce((s, x) => s + x.accuracyM ** 2, 0));
  return {
    from: f,
    to: t,
    transformations: used.map((x) => ({ id: x.id, name: x.name, accuracyM: x.accuracyM, method: x.method })),
    accuracyM,
  };
}

function normaliseLon(lon: number): number {
  if (lon > 180) return lon - 360;
  if (lon < -180) return lon + 360;
  return lon;
}

export { getCrs, listCrs, parseCrsCode, resolveTransformation } from "./crs-registry";
