// Skerrow Island and Kestrel Sound: an invented harbour in open North Sea water near
// 55°12′N 003°02′E, where there is no land in reality, so nothing real is misrepresented.
import type { Knex } from "knex";
import { fromWgs84 } from "../app/lib/geo/crs";
import { formatPosition } from "../app/lib/geo/positions";

const ring = (pts: [number, number][]) => [...pts, pts[0]]; // [lon, lat]

export const SKERROW_LAND = ring([
  [3.03, 55.2035], [3.024, 55.208], [3.028, 55.216], [3.042, 55.225], [3.065, 55.229],
  [3.09, 55.224], [3.098, 55.213], [3.085, 55.204], [3.06, 55.199], [3.042, 55.2],
]);
const INNER_BASIN = ring([[3.0362, 55.2058], [3.0368, 55.2098], [3.0442, 55.2102], [3.0446, 55.2064], [3.0395, 55.2052]]);
export const HARBOUR_BOUNDARY = ring([[2.93, 55.15], [2.93, 55.26], [3.16, 55.26], [3.16, 55.15]]);

const basemap = {
  type: "FeatureCollection",
  features: [
    { type: "Feature", properties: { kind: "land", name: "Skerrow Island" }, geometry: { type: "Polygon", coordinates: [SKERROW_LAND] } },
    { type: "Feature", properties: { kind: "basin", name: "Inner basin" }, geometry: { type: "Polygon", coordinates: [INNER_BASIN] } },
    { type: "Feature", properties: { kind: "breakwater", name: "South Pier" }, geometry: { type: "LineString", coordinates: [[3.0395, 55.2045], [3.0352, 55.2054]] } },
    { type: "Feature", properties: { kind: "breakwater", name: "North Pier" }, geometry: { type: "LineString", coordinates: [[3.0345, 55.2075], [3.0352, 55.2062]] } },
    { type: "Feature", properties: { kind: "shoal", name: "Gannet Bank" }, geometry: { type: "Polygon", coordinates: [ring([[3.028, 55.1915], [3.031, 55.1935], [3.04, 55.1932], [3.042, 55.1912], [3.034, 55.1905]])] } },
  ],
};

// Approach channel from the south-west, 1.5 M long and 200 m wide, lateral marks in pairs
// (IALA region A: red can to port, green cone to starboard, entering from seaward).
const MOUTH = { lat: 55.205, lon: 3.034 };
const M_PER_DEG_LAT = 111_300; // approximate; only used to lay out invented demo positions
const M_PER_DEG_LON = 111_300 * Math.cos((55.2 * Math.PI) / 180);
function offset(p: { lat: number; lon: number }, northM: number, eastM: number) {
  return { lat: p.lat + northM / M_PER_DEG_LAT, lon: p.lon + eastM / M_PER_DEG_LON };
}
const along = (m: number) => offset(MOUTH, -m * Math.SQRT1_2, -m * Math.SQRT1_2); // 225° from the mouth
const portSide = (p: { lat: number; lon: number }) => offset(p, 100 * Math.SQRT1_2, -100 * Math.SQRT1_2);
const starboardSide = (p: { lat: number; lon: number }) => offset(p, -100 * Math.SQRT1_2, 100 * Math.SQRT1_2);

type AidSeed = {
  code: string;
  name: string;
  aid_type: "buoy" | "beacon" | "light";
  iala_category: string | null;
  light_characteristic: string | null;
  at: { lat: number; lon: number };
  crs: "EPSG:4326" | "EPSG:4230";
  chain_length_m?: number;
  depth_m?: number;
  swing_radius_m?: number;
  status?: string;
  remarks?: string;
};

const channelPairs: AidSeed[] = [0, 1, 2, 3].flatMap((i) => {
  const centre = along(2778 - i * 900);
  const n = i * 2 + 1;
  const lights = [["Fl G 5s", "Fl R 5s"], ["Fl(2) G 10s", "Fl(2) R 10s"], ["Fl(3) G 10s", "Fl(3) R 10s"], ["Q G", "Q R"]][i];
  return [
    { code: `KS${n}`, name: `KS${n} starboard-hand buoy`, aid_type: "buoy", iala_category: "starboard", light_characteristic: lights[0], at: starboardSide(centre), crs: i < 2 ? "EPSG:4230" : "EPSG:4326", chain_length_m: 30, depth_m: 10 },
    { code: `KS${n + 1}`, name: `KS${n + 1} port-hand buoy`, aid_type: "buoy", iala_category: "port", light_characteristic: lights[1], at: portSide(centre), crs: i < 2 ? "EPSG:4230" : "EPSG:4326", chain_length_m: 30, depth_m: 10 },
  ] satisfies AidSeed[];
});

export const DEMO_AIDS: AidSeed[] = [
  ...channelPairs,
  { code: "FAIRWAY", name: "Fairway safe water buoy", aid_type: "buoy", iala_category: "safe_water", light_characteristic: "LFl 10s", at: along(3150), crs: "EPSG:4326", chain_length_m: 40, depth_m: 18 },
  { code: "GANNET-S", name: "Gannet South cardinal buoy", aid_type: "buoy", iala_category: "south_cardinal", light_characteristic: "Q(6)+LFl 15s", at: { lat: 55.1895, lon: 3.035 }, crs: "EPSG:4230", chain_length_m: 25, depth_m: 8 },
  { code: "MARLIN", name: "Marlin wreck isolated danger buoy", aid_type: "buoy", iala_category: "isolated_danger", light_characteristic: "Fl(2) 5s", at: { lat: 55.198, lon: 2.99 }, crs: "EPSG:4326", swing_radius_m: 20, remarks: "Replaced the emergency wreck marking buoy in October 2026." },
  { code: "MARLIN-EWM", name: "Marlin emergency wreck marking buoy", aid_type: "buoy", iala_category: "emergency_wreck", light_characteristic: "Al.Bu.Y 3s", at: { lat: 55.1976, lon: 2.9905 }, crs: "EPSG:4326", swing_radius_m: 15, status: "withdrawn" },
  { code: "FARM-NE", name: "Skerrow fish farm NE special mark", aid_type: "buoy", iala_category: "special", light_characteristic: "Fl Y 5s", at: { lat: 55.2175, lon: 3.118 }, crs: "EPSG:4326", swing_radius_m: 15 },
  { code: "FARM-SE", name: "Skerrow fish farm SE special mark", aid_type: "buoy", iala_category: "special", light_characteristic: "Fl Y 5s", at: { lat: 55.2135, lon: 3.118 }, crs: "EPSG:4326", swing_radius_m: 15 },
  { code: "FARM-SW", name: "Skerrow fish farm SW special mark", aid_type: "buoy", iala_category: "special", light_characteristic: "Fl Y 5s", at: { lat: 55.2135, lon: 3.111 }, crs: "EPSG:4326", swing_radius_m: 15 },
  { code: "FARM-NW", name: "Skerrow fish farm NW special mark", aid_type: "buoy", iala_category: "special", light_characteristic: "Fl Y 5s", at: { lat: 55.2175, lon: 3.111 }, crs: "EPSG:4326", swing_radius_m: 15, status: "unlit" },
  { code: "S-PIER", name: "South Pier head light", aid_type: "light", iala_category: null, light_characteristic: "Oc G 6s", at: { lat: 55.2054, lon: 3.0352 }, crs: "EPSG:4326", swing_radius_m: 0 },
  { code: "N-PIER", name: "North Pier head light", aid_type: "light", iala_category: null, light_characteristic: "Oc R 6s", at: { lat: 55.2062, lon: 3.0352 }, crs: "EPSG:4326", swing_radius_m: 0 },
  { code: "SKERROW-E", name: "Skerrow East cardinal buoy", aid_type: "buoy", iala_category: "east_cardinal", light_characteristic: "VQ(3) 5s", at: { lat: 55.213, lon: 3.104 }, crs: "EPSG:4326", chain_length_m: 20, depth_m: 12 },
  { code: "HADDOCK-N", name: "Haddock Ledge north cardinal beacon", aid_type: "beacon", iala_category: "north_cardinal", light_characteristic: "VQ", at: { lat: 55.2305, lon: 3.07 }, crs: "EPSG:4230", swing_radius_m: 0 },
  { code: "TERN-W", name: "Tern Rocks west cardinal buoy", aid_type: "buoy", iala_category: "west_cardinal", light_characteristic: "Q(9) 15s", at: { lat: 55.2165, lon: 3.018 }, crs: "EPSG:4326", chain_length_m: 22, depth_m: 9 },
  { code: "BASIN-SPLIT", name: "Basin Split preferred channel buoy", aid_type: "buoy", iala_category: "preferred_channel_starboard", light_characteristic: "Fl(2+1) G 10s", at: { lat: 55.2072, lon: 3.0395 }, crs: "EPSG:4326", swing_radius_m: 8 },
];

/** The position as it would be read off a chart in that datum (ED50 for the older charts). */
export function chartedText(at: { lat: number; lon: number }, crs: string): string {
  if (crs === "EPSG:4326") return formatPosition(at.lat, at.lon, "ddm", { decimals: 3 });
  const p = fromWgs84(crs, at.lat, at.lon) as { lat: number; lon: number };
  return formatPosition(p.lat, p.lon, "ddm", { decimals: 3 });
}

const polygonWkt = (r: [number, number][]) => `POLYGON((${r.map(([x, y]) => `${x} ${y}`).join(",")}))`;

export async function seed(knex: Knex) {
  const [harbourId] = await knex("harbours").insert({
    slug: "kestrel-sound",
    name: "Kestrel Sound",
    authority_name: "Kestrel Sound Harbour Authority",
    series_code: "KSH",
    general_area: "NORTH SEA",
    default_crs: "EPSG:4326",
    time_zone: "Europe/London",
    boundary: knex.raw("ST_GeomFromText(?, 4326)", [polygonWkt(HARBOUR_BOUNDARY)]),
    basemap_geojson: JSON.stringify(basemap),
    vhf_contact: "Kestrel Sound Harbour Radio, VHF channel 14",
  });
  await knex("aids").insert(
    DEMO_AIDS.map((a) => ({
      harbour_id: harbourId,
      code: a.code,
      name: a.name,
      aid_type: a.aid_type,
      iala_category: a.iala_category,
      iala_region: "A",
      light_characteristic: a.light_characteristic,
      charted_position_text: chartedText(a.at, a.crs),
      charted_crs: a.crs,
      lat: a.at.lat,
      lon: a.at.lon,
      geom: knex.raw("ST_GeomFromText(?, 4326)", [`POINT(${a.at.lon} ${a.at.lat})`]),
      chain_length_m: a.chain_length_m ?? null,
      depth_m: a.depth_m ?? null,
      swing_radius_m: a.swing_radius_m ?? null,
      status: a.status ?? "operating",
      remarks: a.remarks ?? null,
    })),
  );
}
