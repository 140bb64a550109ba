// Shared set-up for the reports tests: the deployment's harbour (the first one, as the app
// uses), an aid of our own with a unique code, and a private S3 fake the tests can stop.
import { randomBytes } from "node:crypto";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { startS3Fake, type S3Fake } from "../../fakes/s3";
import { db } from "~/db.server";
import { direct, inverse } from "~/lib/geo/geodesy";
import { formatPosition } from "~/lib/geo/positions";
import { clearHarbourCache, getDefaultHarbour } from "~/models/harbour.server";
import { configureStorageForTests } from "~/services/storage.server";

export async function ensureHarbour() {
  clearHarbourCache();
  let h = await getDefaultHarbour();
  if (!h) {
    await db("harbours").insert({
      slug: "kestrel-sound-test",
      name: "Kestrel Sound",
      authority_name: "Kestrel Sound Harbour Authority",
      series_code: "KST",
      general_area: "NORTH SEA",
      default_crs: "EPSG:4326",
      time_zone: "Europe/London",
      boundary: db.raw("ST_GeomFromText(?, 4326)", ["POLYGON((2.93 55.15,3.16 55.15,3.16 55.26,2.93 55.26,2.93 55.15))"]),
      basemap_geojson: JSON.stringify({ type: "FeatureCollection", features: [] }),
    });
    clearHarbourCache();
    h = await getDefaultHarbour();
  }
  return h!;
}

/** Charted 55°11.520′N 003°00.830′E (WGS 84), 30 m of chain in 10 m: swing radius √(30² − 10²) = 28.28 m. */
export const CHARTED = { lat: 55 + 11.52 / 60, lon: 3 + 0.83 / 60 };

export async function makeAid(harbourId: number, over: Record<string, unknown> = {}) {
  const code = "T" + randomBytes(3).toString("hex").toUpperCase();
  const [id] = await db("aids").insert({
    harbour_id: harbourId,
    code,
    name: `${code} starboard-hand buoy`,
    aid_type: "buoy",
    iala_category: "starboard",
    iala_region: "A",
    light_characteristic: "Fl(2) G 10s",
    charted_position_text: "55°11.520′N 003°00.830′E",
    charted_crs: "EPSG:4326",
    lat: CHARTED.lat,
    lon: CHARTED.lon,
    geom: db.raw("ST_GeomFromText(?, 4326)", [`POINT(${CHARTED.lon} ${CHARTED.lat})`]),
    chain_length_m: 30,
    depth_m: 10,
    ...over,
  });
  return { id: id as number, code };
}

/**
 * A radar observation of a mark `offsetM` metres from the charted position on `offsetBearing`,
 * taken from 0.5 M to the west-south-west of it: returns the form/API values and the truth.
 */
export function radarObservationOf(offsetM: number, offsetBearingDeg: number, rangeScaleNm = 0.75) {
  const target = direct(CHARTED.lat, CHARTED.lon, offsetBearingDeg, offsetM);
  const own = direct(target.lat, target.lon, 250, 0.5 * 1852);
  const inv = inverse(own.lat, own.lon, target.lat, target.lon);
  return {
    target,
    ownPosition: formatPosition(own.lat, own.lon, "dd", { decimals: 7 }),
    rangeNm: Number((inv.distanceM / 1852).toFixed(5)),
    bearingDeg: Number(inv.initialBearingTrueDeg.toFixed(3)),
    rangeScaleNm,
  };
}

export async function privateS3(): Promise<{ fake: S3Fake; stop(): Promise<void>; restart(): Promise<void>; dir: string; close(): Promise<void> }> {
  const dir = mkdtempSync(join(tmpdir(), "tidewire-reports-s3-"));
  const bucket = "reports-test";
  let fake = await startS3Fake({ port: 0, dir, bucket });
  const port = fake.port;
  configureStorageForTests({ endpoint: fake.endpoint, bucket, region: "us-east-1", accessKeyId: "S3RVER", secretAccessKey: "S3RVER", forcePathStyle: true });
  let running = true;
  return {
    get fake() {
      return fake;
    },
    dir,
    async stop() {
      if (running) await fake.stop();
      running = false;
    },
    async restart() {
      if (!running) fake = await startS3Fake({ port, dir, bucket });
      running = true;
    },
    async close() {
      if (running) await fake.stop();
      running = false;
      configureStorageForTests(null);
    },
  };
}

export const pastIso = (minutesAgo = 30) => new Date(Date.now() - minutesAgo * 60_000).toISOString();
