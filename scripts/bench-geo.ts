/**
 * Geo engine benchmark (single thread): conversions per second WGS 84 ↔ OSGB36 with Tidewire's
 * cached transformers versus calling proj4 directly with definition strings (same run),
 * assessments per second and µs per assessment, and memory.
 *
 *   npm run bench:geo            (BENCH_SECONDS=4 BENCH_ROUNDS=8 for longer runs)
 *
 * Goals (issue 3): ≥ 200,000 WGS 84 ↔ OSGB36 conversions/s cached; an assessment < 50 µs.
 * Each figure is the best of several short rounds (the round least disturbed by other
 * processes), with the median beside it; compare ratios measured in one run.
 */
import { cpus, loadavg } from "node:os";
import proj4 from "proj4";
import { assess, fromWgs84, getCrs, getDatum, proj4Definition, toWgs84 } from "../app/lib/geo/index";

const SECONDS = Number(process.env.BENCH_SECONDS ?? 2);
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 5);

type Rate = { best: number; median: number };

/** Operations per second of `fn(i)` over ROUNDS rounds of SECONDS/ROUNDS each. */
function rate(fn: (i: number) => void): Rate {
  for (let i = 0; i < 2000; i++) fn(i); // warm up the JIT
  const rounds: number[] = [];
  let n = 0;
  const budget = BigInt(Math.round((SECONDS / ROUNDS) * 1e9));
  for (let r = 0; r < ROUNDS; r++) {
    let count = 0;
    const start = process.hrtime.bigint();
    let elapsed = 0n;
    while (elapsed < budget) {
      for (let k = 0; k < 500; k++) fn(n++);
      count += 500;
      elapsed = process.hrtime.bigint() - start;
    }
    rounds.push(count / (Number(elapsed) / 1e9));
  }
  rounds.sort((a, b) => a - b);
  return { best: rounds[rounds.length - 1]!, median: rounds[Math.floor(rounds.length / 2)]! };
}

function mb(n: number): string {
  return `${(n / 1024 / 1024).toFixed(1)} MB`;
}

// Inputs: pseudo-random positions over Great Britain (deterministic).
let seed = 12345;
const rnd = () => (seed = (seed * 1103515245 + 12345) & 0x7fffffff) / 0x7fffffff;
const N = 4096;
const pts = Array.from({ length: N }, () => ({ lat: 50 + rnd() * 8, lon: -6 + rnd() * 7.5 }));
const osgbPts = pts.map((p) => fromWgs84("EPSG:4277", p.lat, p.lon) as { lat: number; lon: number });

const wgsDef = proj4Definition(getCrs(4326)!, getDatum("WGS84").transformations[0]!);
const osgbDef = proj4Definition(getCrs(4277)!, getDatum("OSGB36").transformations[0]!);

const mem0 = process.memoryUsage();
const load0 = loadavg();
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

// A typical assessment: the issue's request with one observation of each kind.
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
// Bodies with a different compass time each: the magnetic model is evaluated afresh every call.
const varied = Array.from({ length: 3600 }, (_, i) => ({
  ...body,
  observations: [body.observations[0], body.observations[1], { ...body.observations[2], observedAt: `2026-11-20T14:${String(Math.floor(i / 60)).padStart(2, "0")}:${String(i % 60).padStart(2, "0")}Z` }],
}));
const assessVaried = rate((i) => {
  sink += assess(varied[i % varied.length]).displacement.distanceM;
});
const assessSame = rate(() => {
  sink += assess(body).displacement.distanceM;
});
const assessGnss = rate(() => {
  sink += assess(gnssOnly).displacement.distanceM;
});
const mem1 = process.memoryUsage();
const load1 = loadavg();

const fmt = (x: number) => Math.round(x).toLocaleString("en");
const us = (x: number) => (1e6 / x).toFixed(1);
const mark = (ok: boolean) => (ok ? "meets goal" : "BELOW GOAL");
const conv = (label: string, r: Rate, goal?: boolean) =>
  console.log(`  ${label.padEnd(36)}${fmt(r.best).padStart(11)} /s  (${fmt(r.median).padStart(9)})${goal === undefined ? "" : `   ${mark(goal)}`}`);
const asmt = (label: string, r: Rate, goal?: boolean) =>
  console.log(`  ${label.padEnd(36)}${fmt(r.best).padStart(8)} /s ${us(r.best).padStart(7)} µs  (${us(r.median).padStart(6)} µs)${goal === undefined ? "" : `   ${mark(goal)}`}`);

console.log(`Tidewire geo benchmark — Node ${process.version}, single thread, best of ${ROUNDS} rounds in ${SECONDS} s per figure (median in brackets)`);
console.log(`Machine: ${cpus().length} cores, load average ${load0[0].toFixed(2)} at start, ${load1[0].toFixed(2)} at end`);
console.log("");
console.log("Conversions WGS 84 ↔ OSGB36 (EPSG:4326 ↔ EPSG:4277, transformation EPSG:1314); goal ≥ 200,000/s");
conv("Tidewire cached, WGS 84 → OSGB36", toOsgbCached, toOsgbCached.best >= 200_000);
conv("Tidewire cached, OSGB36 → WGS 84", toWgsCached, toWgsCached.best >= 200_000);
conv("proj4 direct (strings), → OSGB36", toOsgbProj4);
conv("proj4 direct (strings), → WGS 84", toWgsProj4);
conv("proj4 one prebuilt converter, →OSGB36", toOsgbPrebuilt);
console.log(
  `  ratio Tidewire cached / proj4 direct: → OSGB36 ${(toOsgbCached.best / toOsgbProj4.best).toFixed(1)}×, → WGS 84 ${(toWgsCached.best / toWgsProj4.best).toFixed(1)}×`,
);
console.log("  (→ OSGB36 costs two proj4 calls: the inverse is refined so that A → B → A stays within 1 mm)");
console.log("");
console.log("Assessments (POST /api/v1/assessments body: ED50 charted, GNSS + radar + compass); goal < 50 µs");
asmt("new compass time every call", assessVaried, 1e6 / assessVaried.best < 50);
asmt("the same body repeated", assessSame, 1e6 / assessSame.best < 50);
asmt("one GNSS observation, WGS 84", assessGnss);
console.log("");
console.log("Memory");
console.log(`  rss ${mb(mem1.rss)} (start ${mb(mem0.rss)}), heap used ${mb(mem1.heapUsed)} of ${mb(mem1.heapTotal)}`);
if (!Number.isFinite(sink)) console.log("(checksum not finite)");
