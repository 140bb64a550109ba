// The realistic dataset for the load benchmark: 5,000 notices (ten years of a busy harbour:
// about 2% still in force, the rest expired, cancelled or superseded), 500 aids, 20,000 reports
// and 10,000 subscriptions, in Kestrel Sound, inserted in bulk batches on top of the demo seed.
// Written straight against the tables (not through the app's models) so 35,000 rows take
// seconds. `tsx scripts/quality/seed-large.ts` seeds the database named by DB_* in the env.
import knex, { type Knex } from "knex";

const BATCH = 1000;
const rand = mulberry32(20261201);

function mulberry32(seed: number) {
  let a = seed;
  return () => {
    a |= 0;
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
const pick = <T>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)]!;

// Kestrel Sound (fictional, DEMO.md) around 55.2° N 3.0° E: the bench's bbox covers it.
export const AREA = { minLat: 55.15, maxLat: 55.27, minLon: 2.93, maxLon: 3.12 };
const point = () => ({ lat: AREA.minLat + rand() * (AREA.maxLat - AREA.minLat), lon: AREA.minLon + rand() * (AREA.maxLon - AREA.minLon) });
const ddm = (lat: number, lon: number) => {
  const f = (v: number, w: number, h: [string, string]) => `${String(Math.floor(Math.abs(v))).padStart(w, "0")}°${((Math.abs(v) % 1) * 60).toFixed(2).padStart(5, "0")}′${v >= 0 ? h[0] : h[1]}`;
  return `${f(lat, 2, ["N", "S"])} ${f(lon, 3, ["E", "W"])}`;
};

const TYPES = ["aids_to_navigation_changes", "newly_discovered_dangers", "works", "drifting_hazards"];
const LOCALITIES = ["Kestrel Sound, approach channel", "Skerrow Island, north shore", "Inner harbour, fish quay", "Gannet Rock", "Marina entrance", "Ferry berth", "Outer anchorage"];
const TITLES = ["Buoy unlit", "Dredging in progress", "Diving operations", "Survey vessel working", "Submerged container reported", "Beacon damaged", "Works on breakwater", "Buoy off position", "Cable laying", "Wreck reported"];

async function inBatches(db: Knex, table: string, rows: Record<string, unknown>[]) {
  for (let i = 0; i < rows.length; i += BATCH) await db(table).insert(rows.slice(i, i + BATCH));
}

export async function seedLarge(db: Knex, counts = { notices: 5000, aids: 500, reports: 20_000, subscriptions: 10_000 }): Promise<Record<string, number>> {
  const harbour = (await db("harbours").orderBy("id").first("id", "series_code")) as { id: number; series_code: string } | undefined;
  if (!harbour) throw new Error("seed-large needs the demo harbour (seeds/02_harbour.ts) first");
  const staff = (await db("users").whereIn("role", ["officer", "harbourmaster"]).orderBy("id").select("id")) as { id: number }[];
  const by = staff[0]?.id ?? null;
  const t0 = Date.now();

  // Aids: top up to the target count.
  const haveAids = Number((await db("aids").count({ n: "*" }).first())!.n);
  const aidRows = Array.from({ length: Math.max(0, counts.aids - haveAids) }, (_, i) => {
    const p = point();
    const category = pick(["port", "starboard", "north_cardinal", "south_cardinal", "east_cardinal", "west_cardinal", "isolated_danger", "safe_water", "special"]);
    return {
      harbour_id: harbour.id,
      code: `L${String(i + 1).padStart(4, "0")}`,
      name: `Load-test mark ${i + 1}`,
      aid_type: pick(["buoy", "buoy", "beacon", "light"]),
      iala_category: category,
      iala_region: "A",
      light_characteristic: rand() < 0.6 ? pick(["Fl R 4s", "Fl G 4s", "Q", "VQ(3) 5s", "Iso 4s", "LFl 10s"]) : null,
      charted_position_text: ddm(p.lat, p.lon),
      charted_crs: "EPSG:4326",
      lat: p.lat,
      lon: p.lon,
      geom: db.raw("ST_GeomFromText(?, 4326)", [`POINT(${p.lon} ${p.lat})`]),
      chain_length_m: 20 + Math.round(rand() * 30),
      depth_m: 5 + Math.round(rand() * 20),
      status: rand() < 0.95 ? "operating" : pick(["unlit", "damaged", "off_station"]),
    };
  });
  await inBatches(db, "aids", aidRows);
  const aids = (await db("aids").select("id", "lat", "lon")) as { id: number; lat: number; lon: number }[];

  // Notices: numbered per year after whatever the demo seed published.
  const maxNumber = new Map<number, number>();
  for (const r of (await db("notices").whereNotNull("year").groupBy("year").select("year").max({ m: "number" })) as { year: number; m: number }[]) maxNumber.set(r.year, r.m);
  const now = Date.now();
  const noticeRows: Record<string, unknown>[] = [];
  const geoms: Array<{ kind: string; wkt: string; text: string; coords: number[][] }> = [];
  for (let i = 0; i < counts.notices; i++) {
    const inForce = rand() < 0.02;
    const publishedAt = new Date(inForce ? now - rand() * 60 * 86_400_000 : now - (30 + rand() * 3650) * 86_400_000);
    const year = publishedAt.getUTCFullYear();
    const number = (maxNumber.get(year) ?? 0) + 1;
    maxNumber.set(year, number);
    const ended = inForce ? null : pick(["expired", "expired", "expired", "cancelled", "superseded"]);
    const validUntil = inForce ? (rand() < 0.5 ? null : new Date(now + rand() * 30 * 86_400_000)) : new Date(publishedAt.getTime() + rand() * 60 * 86_400_000);
    const title = `${pick(TITLES)} ${i + 1}`;
    noticeRows.push({
      harbour_id: harbour.id,
      series_code: harbour.series_code,
      year,
      number,
      title,
      general_type: pick(TYPES),
      // TEXT columns: MariaDB applies no default on a multi-row insert without them.
      detail_types: "[]",
      restrictions: "[]",
      urgency: rand() < 0.1 ? "urgent" : "routine",
      status: ended ?? "in_force",
      position_status: "reported",
      valid_from: publishedAt,
      valid_until: validUntil,
      general_area: "NORTH SEA",
      locality: pick(LOCALITIES),
      body: `${title}. Mariners are advised to keep clear and navigate with caution. Load-test notice ${i + 1}.`,
      published_at: publishedAt,
      cancelled_at: ended === "cancelled" || ended === "superseded" ? validUntil : null,
      expired_at: ended === "expired" ? validUntil : null,
      created_by: by,
      published_by: by,
      created_at: publishedAt,
      updated_at: validUntil && !inForce ? validUntil : publishedAt,
    });
    const p = point();
    if (rand() < 0.7) {
      geoms.push({ kind: "point", wkt: `POINT(${p.lon} ${p.lat})`, text: ddm(p.lat, p.lon), coords: [[p.lon, p.lat]] });
    } else {
      const d = 0.002 + rand() * 0.004;
      const ring = [[p.lon, p.lat], [p.lon + d, p.lat], [p.lon + d, p.lat + d], [p.lon, p.lat + d], [p.lon, p.lat]];
      geoms.push({ kind: "area", wkt: `POLYGON((${ring.map(([x, y]) => `${x} ${y}`).join(",")}))`, text: ring.slice(0, 4).map(([x, y]) => ddm(y!, x!)).join("\n"), coords: ring.slice(0, 4) });
    }
  }
  const firstNew = Number((await db("notices").max({ m: "id" }).first())!.m ?? 0);
  await inBatches(db, "notices", noticeRows);
  const newIds = ((await db("notices").where("id", ">", firstNew).orderBy("id").select("id")) as { id: number }[]).map((r) => r.id);
  await inBatches(
    db,
    "notice_parts",
    newIds.map((id, i) => ({
      notice_id: id,
      seq: 1,
      kind: geoms[i]!.kind,
      positions_text: geoms[i]!.text,
      crs: "EPSG:4326",
      coordinates_json: JSON.stringify(geoms[i]!.coords),
      geom: db.raw("ST_GeomFromText(?, 4326)", [geoms[i]!.wkt]),
    })),
  );

  // Reports: mostly closed, against random aids, a few hazards.
  const reportRows = Array.from({ length: counts.reports }, (_, i) => {
    const aid = pick(aids);
    const hazard = rand() < 0.05;
    const lat = aid.lat + (rand() - 0.5) * 0.002;
    const lon = aid.lon + (rand() - 0.5) * 0.003;
    const observed = new Date(now - rand() * 3 * 365 * 86_400_000);
    return {
      harbour_id: harbour.id,
      aid_id: hazard ? null : aid.id,
      hazard_description: hazard ? "Floating debris, partly submerged" : null,
      observation_method: "gnss",
      observation_json: JSON.stringify({ method: "gnss", position: ddm(lat, lon), accuracyM: 10 }),
      observed_at: observed,
      remarks: `Load-test report ${i + 1}`,
      reporter_email: `reporter${i % 2000}@boaters.example`,
      reporter_name: `Reporter ${i % 2000}`,
      status: rand() < 0.03 ? "new" : pick(["acknowledged", "confirmed", "not_confirmed", "duplicate", "closed", "closed", "closed"]),
      observed_lat: lat,
      observed_lon: lon,
      uncertainty_m: 15,
      verdict: hazard ? null : pick(["within_swing_circle", "within_swing_circle", "inconclusive", "off_station"]),
      displacement_m: hazard ? null : Math.round(rand() * 150),
      displacement_bearing_deg: hazard ? null : Math.round(rand() * 360),
      created_at: observed,
      updated_at: observed,
    };
  });
  await inBatches(db, "reports", reportRows);

  // Subscriptions: circles around random points, a third of them the whole harbour.
  const subRows = Array.from({ length: counts.subscriptions }, (_, i) => {
    const p = point();
    const whole = rand() < 0.33;
    const r = 0.5 + rand() * 2;
    const d = r / 60;
    const box = `POLYGON((${p.lon - d} ${p.lat - d},${p.lon + d} ${p.lat - d},${p.lon + d} ${p.lat + d},${p.lon - d} ${p.lat + d},${p.lon - d} ${p.lat - d}))`;
    const cadence = pick(["none", "none", "daily", "weekly"]);
    return {
      email: `subscriber${i}@boaters.example`,
      harbour_id: harbour.id,
      area_kind: whole ? "harbour" : "circle",
      area: whole
        ? db.raw(`ST_GeomFromText(?, 4326)`, [`POLYGON((${AREA.minLon} ${AREA.minLat},${AREA.maxLon} ${AREA.minLat},${AREA.maxLon} ${AREA.maxLat},${AREA.minLon} ${AREA.maxLat},${AREA.minLon} ${AREA.minLat}))`])
        : db.raw("ST_GeomFromText(?, 4326)", [box]),
      centre_lat: whole ? null : p.lat,
      centre_lon: whole ? null : p.lon,
      radius_nm: whole ? null : r,
      general_types: JSON.stringify(rand() < 0.7 ? [] : [pick(TYPES)]),
      urgent_alerts: rand() < 0.8,
      digest_cadence: cadence,
      digest_local_time: cadence === "none" ? null : "07:00",
      digest_weekday: cadence === "weekly" ? 1 : null,
      status: rand() < 0.85 ? "confirmed" : pick(["pending", "ended"]),
      confirmed_at: new Date(now - rand() * 365 * 86_400_000),
    };
  });
  await inBatches(db, "subscriptions", subRows);

  const out: Record<string, number> = {};
  for (const t of ["notices", "notice_parts", "aids", "reports", "subscriptions"]) out[t] = Number((await db(t).count({ n: "*" }).first())!.n);
  out.seconds = Math.round((Date.now() - t0) / 100) / 10;
  return out;
}

// Run directly: seed the database of the environment.
if (import.meta.url === `file://${process.argv[1]}`) {
  const e = process.env;
  const db = knex({ client: "mysql2", connection: { host: e.DB_HOST ?? "127.0.0.1", port: Number(e.DB_PORT ?? 3407), user: e.DB_USER ?? "tidewire", password: e.DB_PASSWORD ?? "tidewire-local", database: e.DB_NAME ?? "tidewire", timezone: "Z" } });
  try {
    console.log(await seedLarge(db));
  } catch (e) {
    console.error(String((e as Error).message).slice(0, 600));
    process.exitCode = 1;
  } finally {
    await db.destroy();
  }
}
