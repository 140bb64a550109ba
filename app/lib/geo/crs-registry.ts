/**
 * Coordinate reference systems Tidewire understands, by EPSG code, with the datum
 * transformations to WGS 84 that it can apply. Pure data and lookups (no proj4 here, so forms
 * can validate a CRS code in the browser without loading proj4).
 *
 * Transformation parameters are copied from the EPSG dataset as carried in PROJ's database
 * (OSGeo/PROJ data/sql/helmert_transformation.sql): each entry names its EPSG transformation
 * code, method, parameters and EPSG's stated accuracy. proj4's `+towgs84` is "source → WGS 84,
 * Position Vector convention" (rotations in arc-seconds, scale in ppm): every entry below is
 * either a geocentric translation or published by EPSG as Position Vector, so no sign change
 * was needed. A Coordinate Frame rotation would need its three rotations negated
 * (see toPositionVector()).
 *
 * Ellipsoids are always given as +a/+rf: proj4 silently treats an unknown +ellps name as WGS 84
 * (its name for WGS 72 is "WGS7", and "WGS72" is silently wrong).
 */

export type CrsKind = "geographic" | "projected";

export interface Ellipsoid {
  name: string;
  /** Semi-major axis, metres. */
  a: number;
  /** Inverse flattening. */
  rf: number;
  epsg: number;
}

// EPSG ellipsoid definitions (EPSG codes 7030, 7019, 7022, 7001, 7008, 7043).
export const ELLIPSOIDS = {
  wgs84: { name: "WGS 84", a: 6378137, rf: 298.257223563, epsg: 7030 },
  grs80: { name: "GRS 1980", a: 6378137, rf: 298.257222101, epsg: 7019 },
  intl: { name: "International 1924", a: 6378388, rf: 297, epsg: 7022 },
  airy: { name: "Airy 1830", a: 6377563.396, rf: 299.3249646, epsg: 7001 },
  // Clarke 1866 is defined by a = 6378206.4 m and b = 6356583.8 m; rf derived from those.
  clarke1866: { name: "Clarke 1866", a: 6378206.4, rf: 6378206.4 / (6378206.4 - 6356583.8), epsg: 7008 },
  wgs72: { name: "WGS 72", a: 6378135, rf: 298.26, epsg: 7043 },
} as const satisfies Record<string, Ellipsoid>;

export type EllipsoidKey = keyof typeof ELLIPSOIDS;

export type TransformationMethod = "geocentric_translations" | "position_vector" | "coordinate_frame";

export interface DatumTransformation {
  /** "EPSG:1133" — the EPSG coordinate-operation code. */
  id: string;
  name: string;
  method: TransformationMethod;
  /** As published: tX tY tZ (m) [rX rY rZ (arc-seconds) dS (ppm)]. */
  params: readonly number[];
  /** EPSG's stated accuracy of the transformation, metres. */
  accuracyM: number;
  area: string;
  /** Where the values were taken from. */
  source: string;
  note?: string;
}

export interface Datum {
  key: DatumKey;
  name: string;
  epsgDatum: number;
  ellipsoid: EllipsoidKey;
  /** Transformations to WGS 84; the first is the default unless `defaultTransformation` says otherwise. */
  transformations: readonly DatumTransformation[];
  defaultTransformation: string;
}

const PROJ_DB = "EPSG dataset via OSGeo/PROJ data/sql/helmert_transformation.sql";

export const DATUMS = {
  WGS84: {
    key: "WGS84",
    name: "WGS 84",
    epsgDatum: 6326,
    ellipsoid: "wgs84",
    transformations: [
      { id: "identity", name: "WGS 84 (no transformation)", method: "geocentric_translations", params: [0, 0, 0], accuracyM: 0, area: "World", source: "definition" },
    ],
    defaultTransformation: "identity",
  },
  ETRS89: {
    key: "ETRS89",
    name: "ETRS89",
    epsgDatum: 6258,
    ellipsoid: "grs80",
    transformations: [
      {
        id: "EPSG:1149",
        name: "ETRS89 to WGS 84 (1)",
        method: "geocentric_translations",
        params: [0, 0, 0],
        accuracyM: 1,
        area: "Europe",
        source: PROJ_DB,
        note: "ETRS89 and WGS 84 coincide to within about 1 m (EPSG).",
      },
    ],
    defaultTransformation: "EPSG:1149",
  },
  ED50: {
    key: "ED50",
    name: "ED50",
    epsgDatum: 6230,
    ellipsoid: "intl",
    transformations: [
      {
        id: "EPSG:1133",
        name: "ED50 to WGS 84 (1)",
        method: "geocentric_translations",
        params: [-87, -98, -121],
        accuracyM: 10,
        area: "Europe (mean of 85 stations)",
        source: PROJ_DB,
        note: "General-purpose European mean; the default because it applies everywhere ED50 is used.",
      },
      {
        id: "EPSG:1311",
        name: "ED50 to WGS 84 (18)",
        method: "position_vector",
        params: [-89.5, -93.8, -123.1, 0, 0, -0.156, 1.2],
        accuracyM: 1,
        area: "UK and Irish offshore (North Sea \"Common Offshore\")",
        source: PROJ_DB,
        note: "Recommended by EPSG for UKCS and Irish offshore petroleum work.",
      },
      {
        id: "EPSG:1138",
        name: "ED50 to WGS 84 (6)",
        method: "geocentric_translations",
        params: [-86, -96, -120],
        accuracyM: 6,
        area: "Ireland and the UK",
        source: PROJ_DB,
      },
      {
        id: "EPSG:1275",
        name: "ED50 to WGS 84 (17)",
        method: "geocentric_translations",
        params: [-84, -97, -117],
        accuracyM: 2,
        area: "France",
        source: PROJ_DB,
      },
    ],
    defaultTransformation: "EPSG:1133",
  },
  OSGB36: {
    key: "OSGB36",
    name: "OSGB 1936",
    epsgDatum: 6277,
    ellipsoid: "airy",
    transformations: [
      {
        id: "EPSG:1314",
        name: "OSGB36 to WGS 84 (6)",
        method: "position_vector",
        params: [446.448, -125.157, 542.06, 0.15, 0.247, 0.842, -20.489],
        accuracyM: 2,
        area: "Great Britain",
        source: PROJ_DB,
        note: "The \"OSGB Petroleum\" transformation; OSTN15 (a grid, not available here) is more accurate.",
      },
      {
        id: "EPSG:1195",
        name: "OSGB36 to WGS 84 (1)",
        method: "geocentric_translations",
        params: [375, -111, 431],
        accuracyM: 21,
        area: "Great Britain",
        source: PROJ_DB,
      },
    ],
    defaultTransformation: "EPSG:1314",
  },
  NAD27: {
    key: "NAD27",
    name: "NAD27",
    epsgDatum: 6267,
    ellipsoid: "clarke1866",
    transformations: [
      {
        id: "EPSG:1173",
        name: "NAD27 to WGS 84 (4)",
        method: "geocentric_translations",
        params: [-8, 160, 176],
        accuracyM: 10,
        area: "USA, contiguous states",
        source: PROJ_DB,
        note: "Default for the contiguous United States; NADCON grids (not available here) are more accurate.",
      },
      {
        id: "EPSG:1172",
        name: "NAD27 to WGS 84 (3)",
        method: "geocentric_translations",
        params: [-10, 158, 187],
        accuracyM: 20,
        area: "Canada",
        source: PROJ_DB,
      },
      {
        id: "EPSG:1174",
        name: "NAD27 to WGS 84 (5)",
        method: "geocentric_translations",
        params: [-9, 161, 179],
        accuracyM: 11,
        area: "USA, contiguous states east of the Mississippi",
        source: PROJ_DB,
      },
      {
        id: "EPSG:1175",
        name: "NAD27 to WGS 84 (6)",
        method: "geocentric_translations",
        params: [-8, 159, 175],
        accuracyM: 7,
        area: "USA, contiguous states west of the Mississippi",
        source: PROJ_DB,
      },
    ],
    defaultTransformation: "EPSG:1173",
  },
  NAD83: {
    key: "NAD83",
    name: "NAD83",
    epsgDatum: 6269,
    ellipsoid: "grs80",
    transformations: [
      {
        id: "EPSG:1188",
        name: "NAD83 to WGS 84 (1)",
        method: "geocentric_translations",
        params: [0, 0, 0],
        accuracyM: 4,
        area: "North America",
        source: PROJ_DB,
      },
    ],
    defaultTransformation: "EPSG:1188",
  },
  WGS72: {
    key: "WGS72",
    name: "WGS 72",
    epsgDatum: 6322,
    ellipsoid: "wgs72",
    transformations: [
      {
        id: "EPSG:1237",
        name: "WGS 72 to WGS 84 (1)",
        method: "position_vector",
        params: [0, 0, 4.5, 0, 0, 0.554, 0.2263],
        accuracyM: 2,
        area: "World",
        source: PROJ_DB,
      },
      {
        id: "EPSG:1238",
        name: "WGS 72 to WGS 84 (2)",
        method: "position_vector",
        params: [0, 0, 4.5, 0, 0, 0.554, 0.219],
        accuracyM: 2,
        area: "World",
        source: PROJ_DB,
        note: "The values used in IOGP Guidance Note 7-2's Position Vector worked example.",
      },
    ],
    defaultTransformation: "EPSG:1237",
  },
  IRENET95: {
    key: "IRENET95",
    name: "IRENET95",
    epsgDatum: 6173,
    ellipsoid: "grs80",
    transformations: [
      {
        id: "IRENET95-WGS84-1",
        name: "IRENET95 to WGS 84 (1)",
        method: "geocentric_translations",
        params: [0, 0, 0],
        accuracyM: 1,
        area: "Ireland",
        source: "name and 1 m accuracy as listed by PROJ for this operation",
        note: "EPSG code of this operation not verified here, so it is identified by name only.",
      },
    ],
    defaultTransformation: "IRENET95-WGS84-1",
  },
} as const satisfies Record<string, Omit<Datum, "key"> & { key: string }>;

export type DatumKey = keyof typeof DATUMS;

export interface CrsDefinition {
  /** EPSG code, e.g. 4230. */
  code: number;
  /** "EPSG:4230" */
  id: string;
  label: string;
  kind: CrsKind;
  datum: DatumKey;
  /** proj4 projection parameters (without ellipsoid or datum), for projected CRSs. */
  projection?: string;
  group: "geographic" | "national grid" | "UTM";
}

const GEOGRAPHIC: CrsDefinition[] = [
  { code: 4326, id: "EPSG:4326", label: "WGS 84", kind: "geographic", datum: "WGS84", group: "geographic" },
  { code: 4258, id: "EPSG:4258", label: "ETRS89", kind: "geographic", datum: "ETRS89", group: "geographic" },
  { code: 4230, id: "EPSG:4230", label: "ED50", kind: "geographic", datum: "ED50", group: "geographic" },
  { code: 4277, id: "EPSG:4277", label: "OSGB36", kind: "geographic", datum: "OSGB36", group: "geographic" },
  { code: 4267, id: "EPSG:4267", label: "NAD27", kind: "geographic", datum: "NAD27", group: "geographic" },
  { code: 4269, id: "EPSG:4269", label: "NAD83", kind: "geographic", datum: "NAD83", group: "geographic" },
  { code: 4322, id: "EPSG:4322", label: "WGS 72", kind: "geographic", datum: "WGS72", group: "geographic" },
];

const NATIONAL_GRIDS: CrsDefinition[] = [
  {
    code: 27700,
    id: "EPSG:27700",
    label: "OSGB36 / British National Grid",
    kind: "projected",
    datum: "OSGB36",
    group: "national grid",
    // EPSG conversion 19916 (British National Grid).
    projection: "+proj=tmerc +lat_0=49 +lon_0=-2 +k=0.9996012717 +x_0=400000 +y_0=-100000 +units=m",
  },
  {
    code: 2157,
    id: "EPSG:2157",
    label: "IRENET95 / Irish Transverse Mercator",
    kind: "projected",
    datum: "IRENET95",
    group: "national grid",
    // EPSG conversion 19962 (Irish Transverse Mercator).
    projection: "+proj=tmerc +lat_0=53.5 +lon_0=-8 +k=0.99982 +x_0=600000 +y_0=750000 +units=m",
  },
];

/** UTM families: EPSG code = base + zone (north) [or southBase + zone]. Zone ranges are the EPSG-defined ones. */
const UTM_FAMILIES: { base: number; south: boolean; datum: DatumKey; label: string; minZone: number; maxZone: number }[] = [
  { base: 32600, south: false, datum: "WGS84", label: "WGS 84", minZone: 1, maxZone: 60 },
  { base: 32700, south: true, datum: "WGS84", label: "WGS 84", minZone: 1, maxZone: 60 },
  { base: 25800, south: false, datum: "ETRS89", label: "ETRS89", minZone: 28, maxZone: 38 },
  { base: 23000, south: false, datum: "ED50", label: "ED50", minZone: 28, maxZone: 38 },
  { base: 26700, south: false, datum: "NAD27", label: "NAD27", minZone: 1, maxZone: 22 },
  { base: 26900, south: false, datum: "NAD83", label: "NAD83", minZone: 1, maxZone: 23 },
];

function utmDefinition(code: number): CrsDefinition | undefined {
  for (const f of UTM_FAMILIES) {
    const zone = code - f.base;
    if (zone >= f.minZone && zone <= f.maxZone && Number.isInteger(zone)) {
      const hemi = f.south ? "S" : "N";
      return {
        code,
        id: `EPSG:${code}`,
        label: `${f.label} / UTM zone ${zone}${hemi}`,
        kind: "projected",
        datum: f.datum,
        group: "UTM",
        projection: `+proj=utm +zone=${zone}${f.south ? " +south" : ""} +units=m`,
      };
    }
  }
  return undefined;
}

const FIXED = new Map<number, CrsDefinition>([...GEOGRAPHIC, ...NATIONAL_GRIDS].map((c) => [c.code, c]));
const UTM_CACHE = new Map<number, CrsDefinition>();

/** The CRS with this EPSG code, or undefined when Tidewire does not support it. */
export function getCrs(code: number): CrsDefinition | undefined {
  const fixed = FIXED.get(code);
  if (fixed) return fixed;
  let utm = UTM_CACHE.get(code);
  if (!utm) {
    utm = utmDefinition(code);
    if (utm) UTM_CACHE.set(code, utm);
  }
  return utm;
}

export type CrsCodeResult = { ok: true; code: number; crs: CrsDefinition } | { ok: false; error: string };

/**
 * Read "EPSG:4230" (also "epsg:4230", "4230" or "urn:ogc:def:crs:EPSG::4230") and check that
 * Tidewire supports it.
 */
export function parseCrsCode(text: string): CrsCodeResult {
  const t = typeof text === "string" ? text.trim() : "";
  if (t === "") return { ok: false, error: "Give a coordinate reference system as EPSG:<code>, e.g. EPSG:4326" };
  const m = /^(?:EPSG:{1,2}|urn:ogc:def:crs:EPSG:[0-9.]*:)?(\d{4,5})$/i.exec(t);
  if (!m) return { ok: false, error: `"${t.slice(0, 40)}" is not an EPSG code: write it as EPSG:<code>, e.g. EPSG:4326` };
  const code = Number(m[1]);
  const crs = getCrs(code);
  if (!crs) {
    return {
      ok: false,
      error: `EPSG:${code} is not supported. Supported: EPSG:4326, 4258, 4230, 4277, 4267, 4269, 4322, 27700, 2157 and UTM zones 326xx/327xx, 258xx, 230xx, 267xx, 269xx`,
    };
  }
  return { ok: true, code, crs };
}

export function getDatum(key: DatumKey): Datum {
  return DATUMS[key] as unknown as Datum;
}

export type TransformationResult = { ok: true; transformation: DatumTransformation } | { ok: false; error: string };

/** The chosen (or default) transformation from this datum to WGS 84. */
export function resolveTransformation(datum: DatumKey, id?: string | null): TransformationResult {
  const d = getDatum(datum);
  const wanted = id == null || id.trim() === "" ? d.defaultTransformation : normaliseTransformationId(id);
  const t = d.transformations.find((x) => x.id.toUpperCase() === wanted.toUpperCase());
  if (!t) {
    return {
      ok: false,
      error: `${id} is not a transformation from ${d.name} to WGS 84 here; choose ${d.transformations.map((x) => x.id).join(" or ")}`,
    };
  }
  return { ok: true, transformation: t };
}

function normaliseTransformationId(id: string): string {
  const t = id.trim();
  return /^\d+$/.test(t) ? `EPSG:${t}` : t;
}

/**
 * proj4 +towgs84 values (Position Vector convention) for a transformation. A published
 * Coordinate Frame rotation differs only in the sign of the three rotations.
 */
export function toPositionVector(t: DatumTransformation): number[] {
  const p = [...t.params];
  if (t.method === "coordinate_frame") {
    p[3] = -p[3]!;
    p[4] = -p[4]!;
    p[5] = -p[5]!;
  }
  return p;
}

export interface CrsSummary {
  id: string;
  code: number;
  label: string;
  kind: CrsKind;
  group: CrsDefinition["group"];
  datum: string;
  defaultTransformation: string;
  transformations: { id: string; name: string; accuracyM: number; area: string }[];
}

/** Every supported CRS, for pickers: geographic first, then national grids, then UTM zones. */
export function listCrs(options: { includeUtm?: boolean } = {}): CrsSummary[] {
  const all: CrsDefinition[] = [...GEOGRAPHIC, ...NATIONAL_GRIDS];
  if (options.includeUtm ?? true) {
    for (const f of UTM_FAMILIES) {
      for (let z = f.minZone; z <= f.maxZone; z++) all.push(getCrs(f.base + z)!);
    }
  }
  return all.map((c) => {
    const d = getDatum(c.datum);
    return {
      id: c.id,
      code: c.code,
      label: c.label,
      kind: c.kind,
      group: c.group,
      datum: d.name,
      defaultTransformation: d.defaultTransformation,
      transformations: d.transformations.map((t) => ({ id: t.id, name: t.name, accuracyM: t.accuracyM, area: t.area })),
    };
  });
}
