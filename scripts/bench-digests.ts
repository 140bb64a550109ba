// `npm run bench:digests`: 10,000 confirmed daily-digest subscriptions and 300 notices in force
// on a throwaway MariaDB; two real worker processes build every due digest and send them to the
// SMTP fake over a socket. Prints build time, send rate and the workers' peak memory.
// Goals (issue 6): all digests built < 10 s, ≥ 100 messages/s, memory bounded (batches).
import { spawn, type ChildProcess } from "node:child_process";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { startTestServices } from "../tests/support/services";
import { ROOT } from "./lib/paths";

const SUBSCRIPTIONS = Number(process.env.BENCH_SUBSCRIPTIONS ?? 10_000);
const NOTICES = Number(process.env.BENCH_NOTICES ?? 300);
const WORKERS = 2;

// A small deterministic generator, so every run builds the same data.
let seed = 20261201;
const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
const between = (a: number, b: number) => a + (b - a) * rnd();

// The Kestrel Sound box (invented waters, DEMO.md): 55.15–55.26 N, 2.93–3.16 E.
const pos = () => ({ lat: between(55.155, 55.255), lon: between(2.935, 3.155) });
const M_LAT = 1 / 60;
const M_LON = 1 / 60 / Math.cos((55.2 * Math.PI) / 180);

function peakKb(pid: number): number {
  try {
    const m = /VmHWM:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, "utf8"));
    return m ? Number(m[1]) : 0;
  } catch {
    return 0;
  }
}

const load = () => readFileSync("/proc/loadavg", "utf8").split(" ").slice(0, 3).join(" ");
const loadBefore = load();
const services = await startTestServices();
Object.assign(process.env, services.env, { NODE_ENV: "test" });
const children: ChildProcess[] = [];
try {
  const { db } = await import("../app/db.server");
  const { createUser } = await import("../app/models/user.server");
  const { createDraft, publishNotice, partFromEntered } = await import("../app/models/notice.server");
  const { getHarbourForMail } = await import("../app/models/subscription.server");
  const { circlePrefilterRing } = await import("../app/lib/subscriptions/area");
  const { GENERAL_TYPE_KEYS } = await import("../app/lib/notices/vocabulary");

  const t0 = Date.now();
  const [harbourId] = await db("harbours").insert({
    slug: "kestrel-sound",
    name: "Kestrel Sound",
    authority_name: "Kestrel Sound Harbour Authority",
    series_code: "KSH",
    general_area: "NORTH SEA",
    default_crs: "EPSG:4326",
    time_zone: "Europe/London",
    boundary: db.raw("ST_GeomFromText(?, 4326)", ["POLYGON((2.93 55.15,3.16 55.15,3.16 55.26,2.93 55.26,2.93 55.15))"]),
  });
  const harbour = (await getHarbourForMail(harbourId, db))!;
  const hm = await createUser({ email: "hm@bench.test", name: "Bench Harbourmaster", role: "harbourmaster", password: "bench password 123", verified: true });
  const officer = { id: hm.id, role: "officer" };
  const now = Date.now();
  const types = GENERAL_TYPE_KEYS.slice(0, 7);

  // 300 notices in force, published over the last 48 h (so about half fall in today's window).
  for (let i = 0; i < NOTICES; i++) {
    const at = new Date(now - between(60_000, 48 * 3600_000));
    const c = pos();
    const kind = i % 3 === 0 ? "point" : i % 3 === 1 ? "circle" : "area";
    const coords: [number, number][] =
      kind === "area"
        ? [[c.lon, c.lat], [c.lon + 0.4 * M_LON, c.lat], [c.lon + 0.4 * M_LON, c.lat + 0.3 * M_LAT], [c.lon, c.lat + 0.3 * M_LAT]]
        : [[c.lon, c.lat]];
    const part = partFromEntered(kind, "EPSG:4326", coords.map(([x, y]) => `${y.toFixed(5)} ${x.toFixed(5)}`).join("\n"), coords, kind === "circle" ? 0.3 : null);
    const draft = await createDraft(
      harbourId,
      {
        title: `Bench notice ${i + 1}`,
        generalType: types[i % types.length],
        detailTypes: [],
        restrictions: [],
        urgency: "routine",
        positionStatus: "reported",
        validFrom: at,
        validUntil: null,
        generalArea: "NORTH SEA",
        locality: "Kestrel Sound",
        charts: "",
        body: "Benchmark notice.",
        relatedRefs: "",
        aidIds: [],
        reportIds: [],
        acceptOutside: true,
        parts: [part],
      } as never,
      officer,
      { at },
      db,
    );
    await publishNotice(draft.id, draft.version, { id: hm.id, role: "harbourmaster" }, { at, acceptOutside: true }, db);
  }
  const tNotices = Date.now() - t0;

  // 10,000 confirmed subscriptions with a daily digest due now: 20 % whole harbour, 50 %
  // circles of 0.3–2 M, 30 % polygons; 40 % want every type.
  const confirmedAt = new Date(now - 24 * 3600_000);
  const due = new Date(now - 60_000);
  const notYet = new Date(now + 24 * 3600_000); // made due once both workers are up
  const rows: Record<string, unknown>[] = [];
  for (let i = 0; i < SUBSCRIPTIONS; i++) {
    const r = rnd();
    const c = pos();
    let area: unknown;
    let extra: Record<string, unknown> = {};
    let kind: string;
    if (r < 0.2) {
      kind = "harbour";
      area = harbour.boundary;
    } else if (r < 0.7) {
      kind = "circle";
      const radiusNm = between(0.3, 2);
      area = { type: "Polygon", coordinates: [circlePrefilterRing(c, radiusNm)] };
      extra = { centre_lat: c.lat, centre_lon: c.lon, radius_nm: radiusNm };
    } else {
      kind = "polygon";
      const w = between(0.5, 2);
      const h = between(0.5, 2);
      const ring = [[c.lon, c.lat], [c.lon + w * M_LON, c.lat + 0.1 * M_LAT], [c.lon + w * M_LON, c.lat + h * M_LAT], [c.lon - 0.1 * M_LON, c.lat + h * M_LAT], [c.lon, c.lat]];
      area = { type: "Polygon", coordinates: [ring] };
      extra = { area_geojson: JSON.stringify(area) };
    }
    const wanted = rnd() < 0.4 ? [] : types.filter(() => rnd() < 0.4);
    rows.push({
      email: `subscriber-${i}@bench.test`,
      harbour_id: harbourId,
      area_kind: kind,
      area: db.raw("ST_GeomFromGeoJSON(?, 1, 4326)", [JSON.stringify(area)]),
      general_types: JSON.stringify(wanted),
      urgent_alerts: false,
      digest_cadence: "daily",
      digest_local_time: "07:00",
      status: "confirmed",
      confirmed_at: confirmedAt,
      last_digest_at: confirmedAt,
      next_digest_at: notYet,
      ...extra,
    });
  }
  for (let i = 0; i < rows.length; i += 500) await db("subscriptions").insert(rows.slice(i, i + 500));
  rows.length = 0;
  const tSetup = Date.now() - t0;
  console.log(`[bench] setup: ${NOTICES} notices in force (${tNotices} ms), ${SUBSCRIPTIONS} subscriptions (${tSetup - tNotices} ms)`);

  // Two real worker processes: digests and outbox only. The clock starts when both are up
  // (TypeScript loading is start-up cost, not digest building) and the digests fall due.
  const spawnedAt = Date.now();
  let ready = 0;
  for (let w = 0; w < WORKERS; w++) {
    const prof = process.env.BENCH_CPU_PROF ? ["--cpu-prof", `--cpu-prof-dir=${join(ROOT, ".local", "prof")}`] : [];
    const child = spawn(process.execPath, [...prof, "--import", "tsx", "app/worker/main.ts"], {
      cwd: ROOT,
      env: { ...process.env, WORKER_JOBS: process.env.BENCH_JOBS ?? "digests,outbox", WORKER_POLL_MS: "100", DIGEST_POLL_MS: "100", OUTBOX_BATCH_SIZE: process.env.OUTBOX_BATCH_SIZE ?? "50", SMTP_MAX_CONNECTIONS: process.env.SMTP_MAX_CONNECTIONS ?? "6" },
      stdio: ["ignore", "pipe", "inherit"],
    });
    child.stdout!.on("data", (d: Buffer) => {
      const text = d.toString();
      process.stdout.write(text);
      if (text.includes("] started")) ready++;
    });
    children.push(child);
  }
  while (ready < WORKERS) await new Promise((r) => setTimeout(r, 20));
  const startupMs = Date.now() - spawnedAt;
  await db("subscriptions").where({ harbour_id: harbourId, status: "confirmed" }).update({ next_digest_at: due });
  const start = Date.now();
  const peaks = new Map<number, number>();
  const samplePeaks = () => children.forEach((c) => c.pid && peaks.set(c.pid, Math.max(peaks.get(c.pid) ?? 0, peakKb(c.pid))));
  const count = async (q: () => Promise<Array<Record<string, unknown>>>) => Number(Object.values((await q())[0])[0]);

  let builtAt = 0;
  let expected = 0;
  let sentAt = 0;
  let firstSendAt = 0;
  const deadline = Date.now() + 10 * 60_000;
  let lastReport = 0;
  for (;;) {
    samplePeaks();
    if (process.env.BENCH_PROGRESS && Date.now() - lastReport > 1000) {
      lastReport = Date.now();
      const runs = await count(() => db("digest_runs").count({ n: "*" }));
      const sentNow = await count(() => db("outbox").where({ kind: "digest", status: "sent" }).count({ n: "*" }));
      console.log(`[bench] +${((Date.now() - start) / 1000).toFixed(1)} s: ${runs} built, ${sentNow} sent`);
    }
    if (!builtAt && (await count(() => db("digest_runs").count({ n: "*" }))) >= SUBSCRIPTIONS) {
      builtAt = Date.now();
      expected = await count(() => db("outbox").where({ kind: "digest" }).count({ n: "*" }));
      console.log(`[bench] all ${SUBSCRIPTIONS} digests built after ${(builtAt - start) / 1000} s (${expected} with content to send)`);
      if (!(process.env.BENCH_JOBS ?? "outbox").includes("outbox")) break;
    }
    const sent = await count(() => db("outbox").where({ kind: "digest", status: "sent" }).count({ n: "*" }));
    if (sent > 0 && !firstSendAt) firstSendAt = Date.now();
    if (builtAt && sent >= expected && expected > 0) {
      sentAt = Date.now();
      break;
    }
    if (Date.now() > deadline) throw new Error("bench did not finish in 10 minutes");
    await new Promise((r) => setTimeout(r, 100));
  }
  samplePeaks();
  if (!sentAt) sentAt = Date.now();
  // An urgent notice in the middle of the harbour, published while every subscriber wants alerts:
  // how long the publishing transaction takes with the alerts queued inside it.
  await db("subscriptions").where({ harbour_id: harbourId }).update({ urgent_alerts: true });
  const urgentPart = partFromEntered("point", "EPSG:4326", "55.2050 3.0450", [[3.045, 55.205]]);
  const urgentDraft = await createDraft(harbourId, { title: "Bench urgent notice", generalType: types[0], detailTypes: [], restrictions: [], urgency: "urgent", positionStatus: "reported", validFrom: new Date(), validUntil: null, generalArea: "NORTH SEA", locality: "Kestrel Sound", charts: "", body: "Benchmark.", relatedRefs: "", aidIds: [], reportIds: [], acceptOutside: true, parts: [urgentPart] } as never, officer, {}, db);
  const tPublish = Date.now();
  const published = await publishNotice(urgentDraft.id, urgentDraft.version, { id: hm.id, role: "harbourmaster" }, { acceptOutside: true }, db);
  const publishMs = Date.now() - tPublish;
  const alertsQueued = await count(() => db("outbox").where("idempotency_key", "like", `alert:%:${published.id}:%`).count({ n: "*" }));
  console.log(`[bench] urgent notice published with ${alertsQueued} alerts queued in the same transaction: ${publishMs} ms`);
  const [{ bytes }] = (await db("outbox").where({ kind: "digest" }).select(db.raw("SUM(LENGTH(body_text) + LENGTH(body_html)) AS bytes")))  as unknown as { bytes: number }[];
  const [{ items }] = (await db("digest_runs").sum({ items: "item_count" })) as unknown as { items: number }[];
  const received = services.env.TEST_MAIL_DIR ? (await import("../fakes/smtp")).readMessages(services.env.TEST_MAIL_DIR).length : 0;

  const buildS = (builtAt - start) / 1000;
  const totalS = (sentAt - start) / 1000;
  const sendS = (sentAt - firstSendAt) / 1000;
  const result = {
    subscriptions: SUBSCRIPTIONS,
    noticesInForce: NOTICES,
    digestsBuilt: SUBSCRIPTIONS,
    digestMessages: expected,
    digestItems: Number(items),
    avgMessageKb: Math.round(Number(bytes) / expected / 1024 * 10) / 10,
    buildAllS: Math.round(buildS * 100) / 100,
    buildRatePerS: Math.round(SUBSCRIPTIONS / buildS),
    allSentS: Math.round(totalS * 100) / 100,
    sendRatePerS: Math.round(expected / sendS),
    receivedBySmtpFake: received,
    workerPeakRssMb: [...peaks.values()].map((kb) => Math.round(kb / 1024)),
  };
  console.log(`[bench] worker start-up (not counted): ${startupMs} ms`);
  console.log(`[bench] digests built: ${SUBSCRIPTIONS} in ${result.buildAllS} s (${result.buildRatePerS}/s; goal < 10 s: ${buildS < 10 ? "met" : "NOT met"})`);
  console.log(`[bench] sent: ${expected} messages (avg ${result.avgMessageKb} kB) in ${Math.round(sendS * 100) / 100} s from first send, ${result.sendRatePerS}/s (goal ≥ 100/s: ${result.sendRatePerS >= 100 ? "met" : "NOT met"}); all sent ${result.allSentS} s after start; SMTP fake received ${received} (digests, and any alerts already sent)`);
  console.log(`[bench] worker peak RSS: ${result.workerPeakRssMb.join(" MB, ")} MB (each holds one batch of ≤ 250 subscriptions)`);
  console.log(`[bench] machine load average (1, 5, 15 min): ${loadBefore} before, ${load()} after, on ${(await import("node:os")).cpus().length} cores`);
  console.log(JSON.stringify({ ...result, loadBefore, loadAfter: load() }));
  await db.destroy();
} finally {
  for (const c of children) if (c.exitCode === null) c.kill("SIGTERM");
  await Promise.all(children.map((c) => new Promise((r) => (c.exitCode !== null ? r(null) : c.on("exit", r)))));
  await services.stop();
}
