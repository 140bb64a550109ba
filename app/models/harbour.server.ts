import { db as defaultDb, type Db } from "~/db.server";

export type Harbour = {
  id: number;
  slug: string;
  name: string;
  authorityName: string;
  seriesCode: string;
  generalArea: string;
  defaultCrs: string;
  timeZone: string;
  vhfContact: string | null;
  /** Boundary polygon as GeoJSON geometry (WGS 84, lon/lat). */
  boundary: { type: string; coordinates: unknown };
  /** Offline base map as a GeoJSON FeatureCollection (land, piers, basins, shoals). */
  basemap: { type: "FeatureCollection"; features: unknown[] } | null;
};

type Row = {
  id: number;
  slug: string;
  name: string;
  authority_name: string;
  series_code: string;
  general_area: string;
  default_crs: string;
  time_zone: string;
  vhf_contact: string | null;
  boundary_json: string;
  basemap_geojson: string | null;
};

function toHarbour(r: Row): Harbour {
  return {
    id: r.id,
    slug: r.slug,
    name: r.name,
    authorityName: r.authority_name,
    seriesCode: r.series_code,
    generalArea: r.general_area,
    defaultCrs: r.default_crs,
    timeZone: r.time_zone,
    vhfContact: r.vhf_contact,
    boundary: JSON.parse(r.boundary_json),
    basemap: r.basemap_geojson ? JSON.parse(r.basemap_geojson) : null,
  };
}

const columns = (db: Db) => [
  "id",
  "slug",
  "name",
  "authority_name",
  "series_code",
  "general_area",
  "default_crs",
  "time_zone",
  "vhf_contact",
  "basemap_geojson",
  db.raw("ST_AsGeoJSON(boundary) AS boundary_json"),
];

// The harbour changes rarely (admin settings): keep it for a short while per process.
const CACHE_TTL_MS = 30_000;
let cache: { at: number; harbour: Harbour | null } | null = null;

/** The harbour this deployment serves (the first one; Tidewire runs one authority per install). */
export async function getDefaultHarbour(db: Db = defaultDb): Promise<Harbour | null> {
  if (db === defaultDb && cache && Date.now() - cache.at < CACHE_TTL_MS) return cache.harbour;
  const row = (await db("harbours").select(columns(db)).orderBy("id").first()) as Row | undefined;
  const harbour = row ? toHarbour(row) : null;
  if (db === defaultDb) cache = { at: Date.now(), harbour };
  return harbour;
}

export async function getHarbourById(id: number, db: Db = defaultDb): Promise<Harbour | null> {
  const row = (await db("harbours").select(columns(db)).where({ id }).first()) as Row | undefined;
  return row ? toHarbour(row) : null;
}

/** Forget the cached harbour (after admin edits, and in tests that reseed). */
export function clearHarbourCache() {
  cache = null;
}

/** True when every geometry (WKT, WGS 84) lies within the harbour boundary. */
export async function withinBoundary(harbourId: number, wkts: string[], db: Db = defaultDb): Promise<boolean> {
  for (const wkt of wkts) {
    const [rows] = (await db.raw("SELECT ST_Within(ST_GeomFromText(?, 4326), boundary) AS inside FROM harbours WHERE id = ?", [wkt, harbourId])) as [
      { inside: number }[],
    ];
    if (!rows[0] || Number(rows[0].inside) !== 1) return false;
  }
  return true;
}
