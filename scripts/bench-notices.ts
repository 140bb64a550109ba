// `npm run bench:notices [-- --duration 10 --rounds 3 --connections 32 --build-dir DIR --size-only]`
//
// GET /api/v1/notices?bbox=… with 5,000 notices seeded (scripts/quality/seed-large.ts on top of
// the demo seed), measured with Debian's wrk side by side with a bare node:http + mysql2 handler
// running the same statements (scripts/lib/bench-notices-bare.ts), in the same run on throwaway
// services. Goal: the API ≥ 50% of the baseline's throughput with zero errors. Then the board
// page's JavaScript before the lazy map chunk, gzipped, from the build's manifest-*.js (budget
// ≤ 120 kB). Prints figures; exits 1 when a goal is missed.
import { spawnSync } from "node:child_process";
import { existsSync, readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { parseArgs } from "node:util";
import { gzipSync } from "node:zlib";
import knex from "knex";
import { aptInstall, findProgram } from "./lib/apt";
import { buildApp, spawnChild, startAppServer, stopChildren, waitForHttp } from "./lib/children";
import { opsConfig, runSeeds } from "./lib/knex-ops";
import { LOCAL } from "./lib/paths";
import { freePort } from "./lib/ports";
import { startTestServices } from "../tests/support/services";
import { seedLarge } from "./quality/seed-large";

const { values: flags } = parseArgs({
  options: { duration: { type: "string", default: "10" }, rounds: { type: "string", default: "3" }, connections: { type: "string", default: "32" }, "build-dir": { type: "string" }, "size-only": { type: "boolean", default: false } },
});
const DURATION_S = Number(flags.duration);
const ROUNDS = Number(flags.rounds);
const CONNECTIONS = Number(flags.connections);
// A chart-sized view over the approach and the island (about a third of the seeded area).
const BBOX: [number, number, number, number] = [2.98, 55.17, 3.08, 55.23];
const BOARD_BUDGET_KB = 120;

/** The board route's JS from the manifest: entry, root, routes/home and their imports (the lazy map chunk is not among them). */
export function boardJs(buildDir: string): { files: string[]; rawBytes: number; gzipBytes: number; lazyMapChunk: string | null } {
  const assets = join(buildDir, "client", "assets");
  const manifestFile = readdirSync(assets).find((f) => /^manifest-.*\.js$/.test(f));
  if (!manifestFile) throw new Error(`no manifest-*.js in ${assets}`);
  const text = readFileSync(join(assets, manifestFile), "utf8");
  const manifest = JSON.parse(text.slice(text.indexOf("{"), text.lastIndexOf("}") + 1)) as {
    entry: { module: string; imports?: string[] };
    routes: Record<string, { module: string; imports?: string[]; clientActionModule?: string; clientLoaderModule?: string }>;
  };
  const files = new Set<string>([manifestFile && `/assets/${manifestFile}`, manifest.entry.module, ...(manifest.entry.imports ?? [])]);
  for (const id of ["root", "routes/home"]) {
    const r = manifest.routes[id];
    if (!r) throw new Error(`route ${id} not in the manifest`);
    files.add(r.module);
    for (const i of r.imports ?? []) files.add(i);
  }
  let rawBytes = 0;
  let gzipBytes = 0;
  for (const f of files) {
    const buf = readFileSync(join(buildDir, "client", f.replace(/^\//, "")));
    rawBytes += buf.length;
    gzipBytes += gzipSync(buf, { level: 9 }).length;
  }
  const lazy = readdirSync(assets).find((f) => /^MapView\.client-.*\.js$/.test(f)) ?? null;
  if (lazy && [...files].some((f) => f.includes(lazy))) throw new Error("the map chunk is in the board's preload");
  return { files: [...files], rawBytes, gzipBytes, lazyMapChunk: lazy };
}

type WrkResult = { name: string; rps: number; latencyAvg: string; non2xx: number; socketErrors: number; requests: number };

function wrk(bin: string, name: string, url: string, durationS: number): WrkResult {
  const r = spawnSync(bin, ["-t2", `-c${CONNECTIONS}`, `-d${durationS}s`, "--latency", url], { encoding: "utf8" });
  if (r.status !== 0) throw new Error(`wrk failed for ${name}: ${r.stderr}`);
  const out = r.stdout;
  const num = (re: RegExp) => Number(re.exec(out)?.[1] ?? 0);
  const socket = /Socket errors: connect (\d+), read (\d+), write (\d+), timeout (\d+)/.exec(out);
  return {
    name,
    rps: num(/Requests\/sec:\s+([\d.]+)/),
    latencyAvg: /Latency\s+(\S+)/.exec(out)?.[1] ?? "?",
    non2xx: num(/Non-2xx or 3xx responses: (\d+)/),
    socketErrors: socket ? socket.slice(1).reduce((s, v) => s + Number(v), 0) : 0,
    requests: num(/(\d+) requests in/),
  };
}

async function main() {
  const buildDir = flags["build-dir"] ?? join(LOCAL, "build-bench-notices");
  if (flags["size-only"]) {
    const js = boardJs(buildDir);
    console.log(`board JS before the map chunk: ${(js.gzipBytes / 1024).toFixed(1)} kB gzipped (${(js.rawBytes / 1024).toFixed(1)} kB raw), budget ${BOARD_BUDGET_KB} kB`);
    return js.gzipBytes <= BOARD_BUDGET_KB * 1024;
  }
  const wrkBin = findProgram("wrk") ?? (aptInstall(["wrk"], "load generator for bench:notices"), findProgram("wrk"));
  if (!wrkBin) throw new Error("wrk is needed: apt-get install -y wrk");
  const services = await startTestServices();
  try {
    const env = { ...process.env, ...services.env, HOST: "127.0.0.1" };
    await runSeeds(env);
    const db = knex(opsConfig(env));
    const t = Date.now();
    const counts = await seedLarge(db, { notices: 5000, aids: 0, reports: 0, subscriptions: 0 });
    console.log(`[bench] seeded in ${Date.now() - t} ms: ${counts.notices} notices, ${counts.notice_parts} parts`);

    const { apiQuery, bboxIdsQuery, noticeIdsInBbox } = await import("../app/models/notice.server");
    const { API_DEFAULT_LIMIT } = await import("../app/lib/notices/api-query");
    // The bench runs within seconds, so `now` in the statements' bindings stays valid.
    const now = new Date();
    const step1 = bboxIdsQuery({ bbox: BBOX }, db, now).toSQL().toNative();
    const ids = await noticeIdsInBbox({ bbox: BBOX }, db, now);
    const main = apiQuery({ bboxIds: ids, limit: API_DEFAULT_LIMIT }, db, now).toSQL().toNative();

    if (!flags["build-dir"] || !existsSync(join(buildDir, "server/index.js"))) console.log(`[bench] build: ${await buildApp(env, buildDir)}`);
    const appPort = await freePort();
    const app = startAppServer({ ...env, PORT: String(appPort), APP_URL: `http://127.0.0.1:${appPort}` }, buildDir);
    await waitForHttp(`http://127.0.0.1:${appPort}/healthz`, app);
    const barePort = await freePort();
    const bare = spawnChild("bare", process.execPath, ["--import", "tsx", "scripts/lib/bench-notices-bare.ts"], {
      env: { ...env, PORT: String(barePort), BENCH_SQL: JSON.stringify({ idsSql: step1.sql, idsBindings: step1.bindings, sql: main.sql, bindings: main.bindings }) },
      quiet: true,
    });
    await waitForHttp(`http://127.0.0.1:${barePort}/`, bare);

    const apiUrl = `http://127.0.0.1:${appPort}/api/v1/notices?bbox=${BBOX.join(",")}`;
    const bareUrl = `http://127.0.0.1:${barePort}/`;
    // Same answer from both before measuring.
    const appBody = (await (await fetch(apiUrl)).json()) as { features: { id: number }[] };
    const bareBody = (await (await fetch(bareUrl)).json()) as { notices: { id: number }[] };
    const appIds = appBody.features.map((f) => f.id).join();
    if (appIds !== bareBody.notices.map((n) => n.id).join()) throw new Error("the API and the baseline return different notices");
    const all = await noticeIdsInBbox({ bbox: BBOX, status: "all" }, db, now);
    console.log(`[bench] bbox ${BBOX.join(",")}: ${all.length} notices intersect, ${ids.length} of them in force (page limit ${API_DEFAULT_LIMIT})`);

    wrk(wrkBin, "warm-up", apiUrl, 2);
    wrk(wrkBin, "warm-up", bareUrl, 2);
    // Alternate the two targets so a change in machine load (other work on the 2 cores) hits both.
    const rounds: { api: WrkResult; base: WrkResult }[] = [];
    for (let i = 0; i < ROUNDS; i++) {
      rounds.push({ api: wrk(wrkBin, "GET /api/v1/notices?bbox=…", apiUrl, DURATION_S), base: wrk(wrkBin, "bare node:http + mysql2", bareUrl, DURATION_S) });
    }
    const sum = (rs: WrkResult[], name: string): WrkResult => ({
      name,
      rps: rs.reduce((s, r) => s + r.requests, 0) / (rs.length * DURATION_S),
      latencyAvg: rs.map((r) => r.latencyAvg).join("/"),
      non2xx: rs.reduce((s, r) => s + r.non2xx, 0),
      socketErrors: rs.reduce((s, r) => s + r.socketErrors, 0),
      requests: rs.reduce((s, r) => s + r.requests, 0),
    });
    const api = sum(rounds.map((r) => r.api), "GET /api/v1/notices?bbox=…");
    const base = sum(rounds.map((r) => r.base), "bare node:http + mysql2");
    for (const [i, r] of rounds.entries()) console.log(`  round ${i + 1}: API ${r.api.rps.toFixed(0)} req/s, baseline ${r.base.rps.toFixed(0)} req/s, ratio ${((r.api.rps / r.base.rps) * 100).toFixed(0)}%`);
    const etag = (await fetch(apiUrl)).headers.get("ETag")!;
    const notModified = spawnSync(wrkBin, ["-t2", `-c${CONNECTIONS}`, `-d${Math.max(2, DURATION_S / 2)}s`, "-H", `If-None-Match: ${etag}`, apiUrl], { encoding: "utf8" }).stdout;
    const rps304 = Number(/Requests\/sec:\s+([\d.]+)/.exec(notModified)?.[1] ?? 0);

    const ratio = api.rps / base.rps;
    console.log("");
    console.log(`wrk -t2 -c${CONNECTIONS} -d${DURATION_S}s × ${ROUNDS} alternating rounds, loopback, load generator on the same 2 cores (load average ${(await import("node:os")).loadavg()[0]!.toFixed(1)})`);
    for (const r of [api, base]) console.log(`  ${r.name.padEnd(30)} ${r.rps.toFixed(0).padStart(7)} req/s  avg ${r.latencyAvg.padStart(8)}  requests ${r.requests}  non-2xx ${r.non2xx}  socket errors ${r.socketErrors}`);
    console.log(`  ${"API with If-None-Match (304)".padEnd(30)} ${rps304.toFixed(0).padStart(7)} req/s`);
    console.log(`  ratio API / baseline: ${(ratio * 100).toFixed(1)}% (goal ≥ 50%, zero errors)`);
    const js = boardJs(buildDir);
    console.log(`  board JS before the lazy map chunk: ${(js.gzipBytes / 1024).toFixed(1)} kB gzipped, ${(js.rawBytes / 1024).toFixed(1)} kB raw, ${js.files.length} files (budget ${BOARD_BUDGET_KB} kB); map chunk ${js.lazyMapChunk} loads after hydration`);
    await db.destroy();
    const errors = api.non2xx + api.socketErrors + base.non2xx + base.socketErrors;
    return ratio >= 0.5 && errors === 0 && js.gzipBytes <= BOARD_BUDGET_KB * 1024;
  } finally {
    await stopChildren();
    await services.stop();
  }
}

const ok = await main();
process.exit(ok ? 0 : 1);
