// `npm run bench:load [-- --duration 30 --connections 200 --quick --no-profile --no-cluster]`
//
// Load benchmark with Debian's wrk from loopback, on the realistic dataset (demo seed plus
// scripts/quality/seed-large.ts: 5,000 notices, 500 aids, 20,000 reports, 10,000 subscriptions):
// the board page, a notice page, GET /api/v1/notices?bbox=… and POST /api/v1/assessments, each
// beside two references measured in the same run — a minimal React Router page served by the
// same scripts/serve.ts (the framework's floor) and a bare node:http + mysql2 handler running
// the same query as the API, in interleaved rounds so the machine's other work falls on both
// alike — then the same pages and API with a new URL per request (no cache can answer), the
// 304 path (If-None-Match), the app as two processes (node:cluster, WEB_CONCURRENCY=2) on one
// database, and CPU profiles of the board from the page cache and without it (node --cpu-prof). Prints throughput, p50/p99, errors and non-2xx/3xx per
// target and the ratios against the goals; writes .local/bench-load.{json,md}.
import { spawnSync } from "node:child_process";
import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { parseArgs } from "node:util";
import knex from "knex";
import { run, spawnChild, waitForHttp, type Child } from "./lib/children";
import { aptInstall, findProgram } from "./lib/apt";
import { LOCAL, ROOT } from "./lib/paths";
import { freePort } from "./lib/ports";
import { AREA, seedLarge } from "./quality/seed-large";
import { startStack } from "./quality/stack";

const { values: flags } = parseArgs({
  options: {
    duration: { type: "string" },
    connections: { type: "string" },
    threads: { type: "string", default: "2" },
    quick: { type: "boolean", default: false },
    "no-profile": { type: "boolean", default: false },
    "no-cluster": { type: "boolean", default: false },
  },
});
const DURATION_S = Number(flags.duration ?? (flags.quick ? 5 : 30));
const CONNECTIONS = Number(flags.connections ?? (flags.quick ? 50 : 200));
const THREADS = Number(flags.threads);
const WARMUP_S = flags.quick ? 1 : 3;

function ensureWrk(): string {
  const found = findProgram("wrk");
  if (found) return found;
  aptInstall(["wrk"], "wrk is missing");
  return findProgram("wrk")!;
}
const WRK = ensureWrk();

// Per-thread status counts (response hook), summed in done() with the latency percentiles.
const SUMMARY_LUA = `
local threads = {}
function setup(thread) table.insert(threads, thread) end
function init(args) statuses = {} end
function response(status, headers, body) statuses[status] = (statuses[status] or 0) + 1 end
done = function(summary, latency, requests)
  local parts = {}
  for _, t in ipairs(threads) do
    local st = t:get("statuses")
    for k, v in pairs(st) do parts[k] = (parts[k] or 0) + v end
  end
  local s = {}
  for k, v in pairs(parts) do table.insert(s, string.format('"%d":%d', k, v)) end
  io.write(string.format('WRKJSON{"requests":%d,"duration_us":%d,"bytes":%d,"connect":%d,"read":%d,"write":%d,"status":%d,"timeout":%d,"p50_us":%d,"p99_us":%d,"max_us":%d,"statuses":{%s}}\\n',
    summary.requests, summary.duration, summary.bytes, summary.errors.connect, summary.errors.read, summary.errors.write,
    summary.errors.status, summary.errors.timeout, latency:percentile(50), latency:percentile(99), latency.max, table.concat(s, ",")))
end
`;

interface WrkResult {
  name: string;
  url: string;
  /** All answers per second (errors included) and answers below 400 per second. */
  rps: number;
  okRps: number;
  p50Ms: number;
  p99Ms: number;
  maxMs: number;
  requests: number;
  errors: number;
  errorKinds: string;
  non2xx3xx: number;
  statuses: string;
  kbPerReq: number;
  /** Raw counts, for combining rounds. */
  raw: { seconds: number; bytes: number; connect: number; read: number; write: number; timeout: number; status: number; statuses: Record<string, number> };
}

const scriptsDir = join(LOCAL, "bench-load");
rmSync(scriptsDir, { recursive: true, force: true });
mkdirSync(scriptsDir, { recursive: true });

function luaFor(o: { method?: string; body?: string; headers?: Record<string, string>; bust?: boolean }): string {
  const lines = [SUMMARY_LUA];
  // A new URL for every request (digits in place of BUST): no cached copy can answer it.
  if (o.bust) lines.push(`request = function() return wrk.format(nil, (wrk.path:gsub("BUST", tostring(math.random(1, 1000000000))))) end`);
  if (o.method) lines.push(`wrk.method = ${JSON.stringify(o.method)}`);
  if (o.body) lines.push(`wrk.body = ${JSON.stringify(o.body)}`);
  for (const [k, v] of Object.entries(o.headers ?? {})) lines.push(`wrk.headers[${JSON.stringify(k)}] = ${JSON.stringify(v)}`);
  return lines.join("\n");
}

function wrk(name: string, url: string, o: { method?: string; body?: string; headers?: Record<string, string>; durationS?: number; connections?: number; bust?: boolean } = {}): WrkResult {
  const file = join(scriptsDir, `${name.replace(/[^a-z0-9]+/gi, "-")}.lua`);
  writeFileSync(file, luaFor(o));
  const args = ["-t", String(THREADS), "-c", String(o.connections ?? CONNECTIONS), "-d", `${o.durationS ?? DURATION_S}s`, "--timeout", "10s", "-s", file, url];
  const r = spawnSync(WRK, args, { encoding: "utf8", maxBuffer: 1 << 24 });
  const m = /WRKJSON(\{.*\})/.exec(r.stdout ?? "");
  if (!m) throw new Error(`wrk for ${name} printed no summary:\n${r.stdout}\n${r.stderr}`);
  const j = JSON.parse(m[1]!) as Record<string, number> & { statuses: Record<string, number> };
  const seconds = j.duration_us! / 1e6;
  return {
    name,
    url,
    rps: j.requests! / seconds,
    okRps: Object.entries(j.statuses).reduce((n, [k, v]) => (Number(k) < 400 ? n + v : n), 0) / seconds,
    p50Ms: j.p50_us! / 1000,
    p99Ms: j.p99_us! / 1000,
    maxMs: j.max_us! / 1000,
    requests: j.requests!,
    errors: j.connect! + j.read! + j.write! + j.timeout!,
    errorKinds: `connect ${j.connect}, read ${j.read}, write ${j.write}, timeout ${j.timeout}`,
    non2xx3xx: j.status!,
    statuses: Object.entries(j.statuses).map(([k, v]) => `${k}: ${v}`).join(", "),
    kbPerReq: j.bytes! / Math.max(1, j.requests!) / 1024,
    raw: { seconds, bytes: j.bytes!, connect: j.connect!, read: j.read!, write: j.write!, timeout: j.timeout!, status: j.status!, statuses: j.statuses },
  };
}

/** Warm up (JIT, pools, caches), then measure. */
function measure(name: string, url: string, o: Parameters<typeof wrk>[2] = {}): WrkResult {
  wrk(`${name} warm-up`, url, { ...o, durationS: WARMUP_S });
  const r = wrk(name, url, o);
  printResult(r);
  return r;
}

function printResult(r: WrkResult) {
  console.log(
    `  ${r.name.padEnd(34)} ${r.okRps.toFixed(0).padStart(7)} ok/s (${r.rps.toFixed(0)} answers/s)  p50 ${r.p50Ms.toFixed(1).padStart(7)} ms  p99 ${r.p99Ms.toFixed(1).padStart(7)} ms  errors ${r.errors}${r.errors ? ` (${r.errorKinds})` : ""}  non-2xx/3xx ${r.non2xx3xx}${r.non2xx3xx ? ` [${r.statuses}]` : ""}  ${r.kbPerReq.toFixed(1)} kB/req`,
  );
}

/** One figure from several rounds: counts summed, p50 the median of the rounds', p99 and max the worst. */
function combine(name: string, url: string, rounds: WrkResult[]): WrkResult {
  const sum = (f: (r: WrkResult) => number) => rounds.reduce((n, r) => n + f(r), 0);
  const seconds = sum((r) => r.raw.seconds);
  const statuses: Record<string, number> = {};
  for (const r of rounds) for (const [k, v] of Object.entries(r.raw.statuses)) statuses[k] = (statuses[k] ?? 0) + v;
  const raw = { seconds, bytes: sum((r) => r.raw.bytes), connect: sum((r) => r.raw.connect), read: sum((r) => r.raw.read), write: sum((r) => r.raw.write), timeout: sum((r) => r.raw.timeout), status: sum((r) => r.raw.status), statuses };
  const requests = sum((r) => r.requests);
  const p50s = rounds.map((r) => r.p50Ms).sort((a, b) => a - b);
  return {
    name,
    url,
    rps: requests / seconds,
    okRps: Object.entries(statuses).reduce((n, [k, v]) => (Number(k) < 400 ? n + v : n), 0) / seconds,
    p50Ms: p50s[Math.floor(p50s.length / 2)]!,
    p99Ms: Math.max(...rounds.map((r) => r.p99Ms)),
    maxMs: Math.max(...rounds.map((r) => r.maxMs)),
    requests,
    errors: raw.connect + raw.read + raw.write + raw.timeout,
    errorKinds: `connect ${raw.connect}, read ${raw.read}, write ${raw.write}, timeout ${raw.timeout}`,
    non2xx3xx: raw.status,
    statuses: Object.entries(statuses).map(([k, v]) => `${k}: ${v}`).join(", "),
    kbPerReq: raw.bytes / Math.max(1, requests) / 1024,
    raw,
  };
}

/**
 * Targets compared with each other are measured in interleaved rounds (each round runs every
 * target for duration/ROUNDS, in a rotated order), so a burst of other work on this shared
 * machine falls on all of them alike instead of on whichever ran at that moment.
 */
const ROUNDS = flags.quick ? 1 : 3;
function measureTogether(targets: Array<{ name: string; url: string; o?: Parameters<typeof wrk>[2] }>): WrkResult[] {
  for (const t of targets) wrk(`${t.name} warm-up`, t.url, { ...t.o, durationS: WARMUP_S });
  const rounds: WrkResult[][] = targets.map(() => []);
  for (let round = 0; round < ROUNDS; round++) {
    for (let k = 0; k < targets.length; k++) {
      const i = (k + round) % targets.length;
      const t = targets[i]!;
      rounds[i]!.push(wrk(`${t.name} round ${round + 1}`, t.url, { ...t.o, durationS: Math.max(1, Math.round(DURATION_S / ROUNDS)) }));
    }
  }
  const out = targets.map((t, i) => combine(t.name, t.url, rounds[i]!));
  for (const r of out) printResult(r);
  if (ROUNDS > 1) {
    const ref = rounds[0]!;
    for (let i = 1; i < targets.length; i++) {
      console.log(`  ${targets[i]!.name} / ${targets[0]!.name} by round: ${rounds[i]!.map((r, k) => `${((r.okRps / ref[k]!.okRps) * 100).toFixed(0)}%`).join(", ")}`);
    }
  }
  return out;
}

/** A GET on a fresh connection (after a wrk run the pooled ones may be half-closed), retried. */
async function get(url: string, headers: Record<string, string> = {}): Promise<Response> {
  for (let i = 0; ; i++) {
    try {
      return await fetch(url, { headers: { ...headers, Connection: "close" } });
    } catch (e) {
      if (i >= 4) throw e;
      await new Promise((r) => setTimeout(r, 500 * (i + 1)));
    }
  }
}

const results: WrkResult[] = [];
const extra: Record<string, unknown> = {};
const t0 = Date.now();
console.log(`[bench] wrk ${THREADS} threads, ${CONNECTIONS} connections, ${DURATION_S} s per target (after ${WARMUP_S} s warm-up)`);

const stack = await startStack({
  seed: true,
  durable: false,
  beforeApp: async (env) => {
    const db = knex({ client: "mysql2", connection: { host: env.DB_HOST, port: Number(env.DB_PORT), user: env.DB_USER, password: env.DB_PASSWORD, database: env.DB_NAME, timezone: "Z" } });
    try {
      const counts = await seedLarge(db);
      console.log(`[bench] dataset: ${JSON.stringify(counts)}`);
      extra.dataset = counts;
    } finally {
      await db.destroy();
    }
  },
});
const children: Child[] = [];
try {
  const appEnv = { ...process.env, ...stack.env, NODE_ENV: "production" };
  const base = stack.baseURL;

  // The references.
  await run("minimal app build", process.execPath, [join(ROOT, "node_modules/@react-router/dev/bin.js"), "build", "scripts/quality/minimal-app"], appEnv);
  const minimalPort = await freePort();
  const minimal = spawnChild("minimal app", process.execPath, ["--import", "tsx", "scripts/serve.ts"], {
    env: { ...appEnv, BUILD_DIR: join(LOCAL, "minimal-app-build"), PORT: String(minimalPort) },
    quiet: true,
  });
  children.push(minimal);
  await waitForHttp(`http://127.0.0.1:${minimalPort}/`, minimal);

  const bbox = [AREA.minLon, AREA.minLat, AREA.maxLon, AREA.maxLat].join(",");
  // The API's own statements (app/models/notice.server.ts): the bbox step, then the page.
  const models = await import("../app/models/notice.server");
  const { API_DEFAULT_LIMIT } = await import("../app/lib/notices/api-query");
  const box: [number, number, number, number] = [AREA.minLon, AREA.minLat, AREA.maxLon, AREA.maxLat];
  const statements: Array<{ sql: string; bindings: readonly unknown[] }> = [];
  if (typeof models.bboxIdsQuery === "function") {
    const step1 = models.bboxIdsQuery({ bbox: box }, stack.db).toSQL().toNative();
    const ids = await models.noticeIdsInBbox({ bbox: box }, stack.db);
    const step2 = models.apiQuery({ bbox: box, bboxIds: ids, limit: API_DEFAULT_LIMIT }, stack.db).toSQL().toNative();
    statements.push(step1, step2);
  } else {
    statements.push(models.apiQuery({ bbox: box, limit: API_DEFAULT_LIMIT } as never, stack.db).toSQL().toNative());
  }
  const barePort = await freePort();
  const bare = spawnChild("bare handler", process.execPath, ["--import", "tsx", "scripts/quality/bare-notices.ts"], {
    env: { ...appEnv, PORT: String(barePort), BARE_SQL: JSON.stringify(statements) },
    quiet: true,
  });
  children.push(bare);
  await waitForHttp(`http://127.0.0.1:${barePort}/`, bare);

  const notice = (await stack.db("notices").where({ status: "in_force" }).orderBy("id", "desc").first("id")) as { id: number };
  const apiUrl = `${base}/api/v1/notices?bbox=${bbox}`;
  const check = async (url: string) => {
    const r = await get(url);
    if (!r.ok) throw new Error(`${url} answered ${r.status}`);
    return r;
  };
  for (const u of [`${base}/`, `${base}/notices/${notice.id}`, apiUrl, `http://127.0.0.1:${barePort}/`, `http://127.0.0.1:${minimalPort}/`]) await check(u);
  const apiCount = ((await (await check(apiUrl)).json()) as { features: unknown[] }).features.length;
  extra.apiFeatures = apiCount;
  console.log(`[bench] API page for the bbox: ${apiCount} notices (limit ${API_DEFAULT_LIMIT}); notice page ${notice.id}`);

  const assessment = JSON.stringify({
    charted: { position: "55°12.300′N 003°02.040′E", crs: "EPSG:4326" },
    swingRadiusM: 30,
    observations: [{ method: "gnss", position: "55°12.310′N 003°02.110′E", accuracyM: 5, observedAt: "2026-11-20T14:05:00Z" }],
  });
  const assessed = await fetch(`${base}/api/v1/assessments`, { method: "POST", headers: { "Content-Type": "application/json", Connection: "close" }, body: assessment });
  if (!assessed.ok) throw new Error(`POST /api/v1/assessments answered ${assessed.status}: ${await assessed.text()}`);

  console.log(`\n[bench] pages (one app process; ${ROUNDS} interleaved rounds)`);
  const [minimalR, board, noticePage] = measureTogether([
    { name: "minimal React Router page", url: `http://127.0.0.1:${minimalPort}/` },
    { name: "board /", url: `${base}/` },
    { name: `notice page /notices/${notice.id}`, url: `${base}/notices/${notice.id}` },
  ]) as [WrkResult, WrkResult, WrkResult];
  console.log(`\n[bench] API (one app process; ${ROUNDS} interleaved rounds)`);
  const [bareR, api] = measureTogether([
    { name: "bare node:http + mysql2 (same query)", url: `http://127.0.0.1:${barePort}/` },
    { name: "GET /api/v1/notices?bbox=…", url: apiUrl },
  ]) as [WrkResult, WrkResult];
  const post = measure("POST /api/v1/assessments", `${base}/api/v1/assessments`, { method: "POST", body: assessment, headers: { "Content-Type": "application/json" } });
  results.push(minimalR, board, noticePage, bareR, api, post);

  // The same pages and API with a new URL each time: every request misses the page, payload and
  // body caches (app/services/http-cache.server.ts) and does the whole work, as the first reader
  // after each change does.
  console.log("\n[bench] without the caches (a new URL for every request)");
  // Beside their references again, in interleaved rounds of their own.
  const [minimalAgain, boardUncached, noticeUncached] = measureTogether([
    { name: "minimal React Router page (again)", url: `http://127.0.0.1:${minimalPort}/` },
    { name: "board / (uncached)", url: `${base}/?v=BUST`, o: { bust: true } },
    { name: `notice page (uncached)`, url: `${base}/notices/${notice.id}?v=BUST`, o: { bust: true } },
  ]) as [WrkResult, WrkResult, WrkResult];
  const [bareAgain, apiUncached] = measureTogether([
    { name: "bare node:http + mysql2 (again)", url: `http://127.0.0.1:${barePort}/` },
    { name: "GET /api/v1/notices (uncached)", url: `${apiUrl}BUST`, o: { bust: true } },
  ]) as [WrkResult, WrkResult];
  results.push(minimalAgain, boardUncached, noticeUncached, bareAgain, apiUncached);

  console.log("\n[bench] validators: the 304 path (If-None-Match)");
  for (const [name, url] of [["board / (304)", `${base}/`], [`notice page (304)`, `${base}/notices/${notice.id}`], ["GET /api/v1/notices (304)", apiUrl]] as const) {
    const first = await get(url);
    const etag = first.headers.get("etag");
    const cc = first.headers.get("cache-control");
    await first.arrayBuffer();
    if (!etag) {
      console.log(`  ${name}: no ETag sent (Cache-Control: ${cc}) — no 304 path`);
      extra[`${name} etag`] = null;
      continue;
    }
    const again = await get(url, { "If-None-Match": etag });
    console.log(`  ${name}: ETag ${etag}, Cache-Control "${cc}", revalidation answers ${again.status}`);
    if (again.status === 304) results.push(measure(name, url, { headers: { "If-None-Match": etag } }));
  }

  if (!flags["no-cluster"]) {
    console.log("\n[bench] two app processes (node:cluster, WEB_CONCURRENCY=2) on the same database");
    const clusterPort = await freePort();
    const cluster = spawnChild("app ×2", process.execPath, ["--import", "tsx", "scripts/serve.ts"], {
      env: { ...appEnv, BUILD_DIR: stack.buildDir, PORT: String(clusterPort), APP_URL: `http://127.0.0.1:${clusterPort}`, WEB_CONCURRENCY: "2" },
      quiet: true,
    });
    children.push(cluster);
    await waitForHttp(`http://127.0.0.1:${clusterPort}/healthz`, cluster);
    results.push(measure("×2 board /", `http://127.0.0.1:${clusterPort}/`));
    results.push(measure("×2 GET /api/v1/notices?bbox=…", `http://127.0.0.1:${clusterPort}/api/v1/notices?bbox=${bbox}`));
    cluster.proc.kill("SIGTERM");
    await cluster.exited;
  }

  if (!flags["no-profile"]) {
    // Two profiles: the board as most readers get it (from the page cache) and with a new URL
    // per request (the whole rendering path: loaders, serialisation, React).
    const profiles: Record<string, unknown> = {};
    for (const [label, path, bust] of [
      ["board (cached copies)", "/", false],
      ["board without caches (a new URL per request)", "/?v=BUST", true],
    ] as const) {
      console.log(`\n[bench] CPU profile: ${label} (node --cpu-prof, 50 connections)`);
      const profDir = join(LOCAL, "bench-load", `profile-${bust ? "uncached" : "cached"}`);
      rmSync(profDir, { recursive: true, force: true });
      mkdirSync(profDir, { recursive: true });
      const profPort = await freePort();
      const prof = spawnChild("app (profiled)", process.execPath, ["--cpu-prof", "--cpu-prof-dir", profDir, "--import", "tsx", "scripts/serve.ts"], {
        env: { ...appEnv, BUILD_DIR: stack.buildDir, PORT: String(profPort), APP_URL: `http://127.0.0.1:${profPort}` },
        quiet: true,
      });
      children.push(prof);
      await waitForHttp(`http://127.0.0.1:${profPort}/healthz`, prof);
      const pr = wrk(`profiled ${label}`, `http://127.0.0.1:${profPort}${path}`, { connections: 50, durationS: Math.min(DURATION_S, 10), bust });
      prof.proc.kill("SIGTERM");
      await prof.exited;
      const file = readdirSync(profDir).filter((f) => f.endsWith(".cpuprofile")).map((f) => join(profDir, f))[0];
      if (file) {
        const summary = summariseProfile(file, pr.requests);
        profiles[label] = summary;
        console.log(`  profile ${file}: ${pr.requests} requests`);
        for (const l of summary.lines) console.log(`  ${l}`);
      }
    }
    extra.profile = profiles;
  }

  // Ratios and goals.
  // Successful answers only: a fast 503 must not count as throughput.
  const ratio = (a: WrkResult, b: WrkResult) => a.okRps / b.okRps;
  const goals = [
    { goal: "board ≥ 70% of the minimal page", value: ratio(board, minimalR), min: 0.7 },
    { goal: "notice page ≥ 70% of the minimal page", value: ratio(noticePage, minimalR), min: 0.7 },
    { goal: "API ≥ 50% of the bare handler", value: ratio(api, bareR), min: 0.5 },
  ];
  const uncached = [
    { goal: "board without caches, against the minimal page", value: ratio(boardUncached, minimalAgain) },
    { goal: "notice page without caches, against the minimal page", value: ratio(noticeUncached, minimalAgain) },
    { goal: "API without caches, against the bare handler", value: ratio(apiUncached, bareAgain) },
  ];
  const errorsTotal = results.reduce((s, r) => s + r.errors + r.non2xx3xx, 0);
  console.log("\n[bench] goals");
  for (const g of goals) console.log(`  ${g.goal}: ${(g.value * 100).toFixed(0)}% ${g.value >= g.min ? "met" : "NOT MET"}`);
  console.log(`  zero errors at ${CONNECTIONS} connections: ${errorsTotal === 0 ? "met" : `NOT MET (${errorsTotal})`}`);
  for (const u of uncached) console.log(`  (for information) ${u.goal}: ${(u.value * 100).toFixed(0)}%`);

  const table = [
    `| target | ok req/s | all answers/s | p50 ms | p99 ms | socket errors | non-2xx/3xx |`,
    `|---|---:|---:|---:|---:|---:|---:|`,
    ...results.map((r) => `| ${r.name} | ${r.okRps.toFixed(0)} | ${r.rps.toFixed(0)} | ${r.p50Ms.toFixed(1)} | ${r.p99Ms.toFixed(1)} | ${r.errors}${r.errors ? ` (${r.errorKinds})` : ""} | ${r.non2xx3xx}${r.non2xx3xx ? ` (${r.statuses})` : ""} |`),
    "",
    ...goals.map((g) => `- ${g.goal}: **${(g.value * 100).toFixed(0)}%** (${g.value >= g.min ? "met" : "not met"})`),
    `- zero errors at ${CONNECTIONS} connections: ${errorsTotal === 0 ? "met" : `not met (${errorsTotal})`}`,
    ...uncached.map((u) => `- (for information) ${u.goal}: ${(u.value * 100).toFixed(0)}%`),
  ].join("\n");
  writeFileSync(join(LOCAL, "bench-load.md"), `wrk ${THREADS} threads, ${CONNECTIONS} connections, ${DURATION_S} s per target, ${new Date().toISOString()}\n\n${table}\n`);
  writeFileSync(join(LOCAL, "bench-load.json"), JSON.stringify({ at: new Date().toISOString(), durationS: DURATION_S, connections: CONNECTIONS, results, goals, uncached, extra }, null, 1));
  console.log(`\n[bench] done in ${((Date.now() - t0) / 1000).toFixed(0)} s; .local/bench-load.md and .json written`);
  process.exitCode = goals.every((g) => g.value >= g.min) && errorsTotal === 0 ? 0 : 1;
} finally {
  for (const c of children) if (c.proc.exitCode === null) c.proc.kill("SIGTERM");
  await Promise.all(children.map((c) => c.exited));
  await stack.stop();
}

/** Self time per function and per package from a .cpuprofile, for the top of the list. */
function summariseProfile(file: string, requests: number) {
  const p = JSON.parse(readFileSync(file, "utf8")) as {
    nodes: Array<{ id: number; callFrame: { functionName: string; url: string; lineNumber: number }; hitCount?: number }>;
    startTime: number;
    endTime: number;
    samples: number[];
  };
  const totalUs = p.endTime - p.startTime;
  const perSample = totalUs / Math.max(1, p.samples.length);
  const byFn = new Map<string, number>();
  const byPkg = new Map<string, number>();
  let busy = 0;
  for (const n of p.nodes) {
    const hits = n.hitCount ?? 0;
    if (!hits) continue;
    const fn = n.callFrame.functionName || "(anonymous)";
    const url = n.callFrame.url;
    if (fn === "(idle)" || fn === "(program)" || fn === "(garbage collector)") {
      byPkg.set(fn, (byPkg.get(fn) ?? 0) + hits);
      if (fn !== "(idle)") busy += hits;
      continue;
    }
    busy += hits;
    const where = url.replace(/^file:\/\//, "").replace(ROOT + "/", "");
    const pkg = /node_modules\/((?:@[^/]+\/)?[^/]+)/.exec(where)?.[1] ?? (where.startsWith("node:") || !where ? "node internals" : where.includes("build") ? "app (build)" : where);
    byFn.set(`${fn} (${where.split("/").slice(-2).join("/")}:${n.callFrame.lineNumber + 1})`, (byFn.get(`${fn} (${where.split("/").slice(-2).join("/")}:${n.callFrame.lineNumber + 1})`) ?? 0) + hits);
    byPkg.set(pkg, (byPkg.get(pkg) ?? 0) + hits);
  }
  const pct = (h: number) => ((h / Math.max(1, busy)) * 100).toFixed(1);
  const lines = [
    `busy CPU ${((busy * perSample) / 1000).toFixed(0)} ms for ${requests} requests = ${((busy * perSample) / 1000 / Math.max(1, requests)).toFixed(2)} ms per board page`,
    "by package (self time, % of busy):",
    ...[...byPkg].filter(([k]) => k !== "(idle)").sort((a, b) => b[1] - a[1]).slice(0, 12).map(([k, h]) => `  ${pct(h).padStart(5)}%  ${k}`),
    "top functions (self time):",
    ...[...byFn].sort((a, b) => b[1] - a[1]).slice(0, 15).map(([k, h]) => `  ${pct(h).padStart(5)}%  ${k}`),
  ];
  return { file, busyMsPerRequest: (busy * perSample) / 1000 / Math.max(1, requests), lines };
}
