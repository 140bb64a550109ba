/**
 * Geo engine benchmark (single core): conversions per second WGS 84 ↔ OSGB36 with Tidewire's
 * cached transformers versus calling proj4 directly with definition strings (same run),
 * assessments per second and µs per assessment, and memory.
 *
 *   npm run bench:geo            (BENCH_SECONDS=2 for longer runs)
 *
 * Goals (issue 3): ≥ 200,000 WGS 84 ↔ OSGB36 conversions/s cached; an assessment < 50 µs.
 * Figures move with machine load: compare the ratios measured in one run.
 */
import { cpus, loadavg } from "node:os";
import proj4 from "proj4";
import { assess, fromWgs84, getCrs, getDatum, proj4Definition, toWgs84 } from "../app/lib/geo/index";

const SECONDS = Number(process.env.BENCH_SECONDS ?? 1);

function mb(n: number): string {
  return `${(n / 1024 / 1024).toFixed(1)} MB`;
}

/** Run `fn(i)` repeatedly for about SECONDS; returns operations per second. */
function rate(fn: (i: number) => void): number {
  for (let i = 0; i < 2000; i++) fn(i); // warm up the JIT
  let n = 0;
  const start = process.hrtime.bigint();
  const budget = BigInt(Math.round(SECONDS * 1e9));
  let elapsed = 0n;
  while (elapsed < budget) {
    for (let k = 0; k < 1000; k++) fn(n++);
    elapsed = process.hrtime.bigint() - start;
  }
  return n / (Number(elapsed) / 1e9);
}

// Inputs: pseudo-random positions over Great Britain (deterministic).
let seed = 12345;
const rnd = () => ((seed = (seed * 1103515245 + 12345) & 0x7fffffff) / 0x7fffffff);
const N = 4096;
const pts = Array.from({ length: N }, () => ({ lat: 50 + rnd() * 8, lon: -6 + rnd() * 7.5 }));
const osgbPts = pts.map((p) => fromWgs84("EPSG:4277", p.lat, p.lon) as { lat: number; lon: number });

const wgsDef = proj4Definition(getCrs(4326)!, getDatum("WGS84").transformations[0]!);
const osgbDef = proj4Definition(getCrs(4277)!, getDatum("OSGB36").transformations[0]!);

const mem0 = process.memoryUsage();
let sink = 0;

const toOsgbCached = rate((i) => {
  const p = pts[i & (N - 1)]!;
  sink += (fromWgs84("EPSG:4277", p.lat, p.lon) as { lat: number }).lat;
});
const toWgsCached = rate((i) => {
  const p = osgbPts[i & (N - 1)]!;
  sink += toWgs84("EPSG:4277", p).lat;
});
const toOsgbProj4 = rate((i) => {
  const p = pts[i & (N - 1)]!;
  sink += proj4(wgsDef, osgbDef, [p.lon, p.lat])[1]!;
});
const toWgsProj4 = rate((i) => {
  const p = osgbPts[i & (N - 1)]!;
  sink += proj4(osgbDef, wgsDef, [p.lon, p.lat])[1]!;
});
const prebuilt = proj4(wgsDef, osgbDef);
const toOsgbPrebuilt = rate((i) => {
  const p = pts[i & (N - 1)]!;
  sink += prebuilt.forward([p.lon, p.lat])[1]!;
});

// A typical assessment: the request with one observation of each kind.
const body = {
  charted: { position: "55°12.30′N 003°01.10′E", crs: "EPSG:4230" },
  swingRadiusM: 25,
  observations: [
    { method: "gnss", position: "55°12.28′N 003°01.02′E", observedAt: "2026-11-20T14:05:00Z" },
    { method: "radar", ownPosition: "55°12.05′N 003°00.70′E", rangeNm: 0.42, bearingDeg: 47, bearingRef: "true", rangeScaleNm: 0.75, observedAt: "2026-11-20T14:10:00Z" },
    { method: "compass", ownPosition: "55°12.15′N 003°00.75′E", bearingMagneticDeg: 95, distanceM: 300, observedAt: "2026-11-20T14:20:00Z" },
  ],
};
const gnssOnly = { charted: { position: "55.205 3.0183", crs: "EPSG:4326" }, swingRadiusM: 25, observations: [body.observations[0]] };
// Vary the compass time so the declination cache does not hide the magnetic model's cost.
const assessRate = rate((i) => {
  const b = { ...body, observations: [body.observations[0], body.observations[1], { ...body.observations[2], observedAt: `2026-11-20T14:${String(i % 60).padStart(2, "0")}:${String((i >> 6) % 60).padStart(2, "0")}Z` }] };
  sink += assess(b).displacement.distanceM;
});
const assessCachedRate = rate(() => {
  sink += assess(body).displacement.distanceM;
});
const assessGnssRate = rate(() => {
  sink += assess(gnssOnly).displacement.distanceM;
});
const mem1 = process.memoryUsage();

const fmt = (x: number) => Math.round(x).toLocaleString("en");
const us = (r: number) => (1e6 / r).toFixed(1);
const mark = (ok: boolean) => (ok ? "meets goal" : "BELOW GOAL");

console.log(`Tidewire geo benchmark — Node ${process.version}, ${SECONDS}s per figure, single thread`);
console.log(`Machine: ${cpus().length} cores, load average ${loadavg().map((x) => x.toFixed(2)).join(" ")} (other processes slow every figure alike; compare ratios)`);
console.log("");
console.log("Conversions WGS 84 ↔ OSGB36 (EPSG:4326 ↔ EPSG:4277, transformation EPSG:1314)");
console.log(`  Tidewire cached, WGS 84 → OSGB36   ${fmt(toOsgbCached).padStart(12)} /s   ${mark(toOsgbCached >= 200_000)} (≥ 200,000)`);
console.log(`  Tidewire cached, OSGB36 → WGS 84   ${fmt(toWgsCached).padStart(12)} /s   ${mark(toWgsCached >= 200_000)} (≥ 200,000)`);
console.log(`  proj4 direct (strings), → OSGB36   ${fmt(toOsgbProj4).padStart(12)} /s`);
console.log(`  proj4 direct (strings), → WGS 84   ${fmt(toWgsProj4).padStart(12)} /s`);
console.log(`  proj4 prebuilt converter, → OSGB36 ${fmt(toOsgbPrebuilt).padStart(12)} /s   (no exact-inverse refinement)`);
console.log(`  ratio cached / proj4 direct:  → OSGB36 ${(toOsgbCached / toOsgbProj4).toFixed(1)}×   → WGS 84 ${(toWgsCached / toWgsProj4).toFixed(1)}×`);
console.log("");
console.log("Assessments (POST /api/v1/assessments body: ED50 charted, GNSS + radar + compass)");
console.log(`  new compass time each call       ${fmt(assessRate).padStart(8)} /s   ${us(assessRate).padStart(6)} µs   ${mark(1e6 / assessRate < 50)} (< 50 µs)`);
console.log(`  same body repeated               ${fmt(assessCachedRate).padStart(8)} /s   ${us(assessCachedRate).padStart(6)} µs`);
console.log(`  one GNSS observation, WGS 84     ${fmt(assessGnssRate).padStart(8)} /s   ${us(assessGnssRate).padStart(6)} µs`);
console.log("");
console.log("Memory");
console.log(`  rss ${mb(mem1.rss)} (start ${mb(mem0.rss)}), heap used ${mb(mem1.heapUsed)} of ${mb(mem1.heapTotal)}`);
if (!Number.isFinite(sink)) console.log("(checksum not finite)");
