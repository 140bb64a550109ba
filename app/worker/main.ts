// The background worker: delivers the outbox and runs scheduled jobs (app/worker/jobs.ts).
// Several can run at once: every job claims its work with FOR UPDATE SKIP LOCKED.
// WORKER_JOBS=outbox,digests limits which jobs this process runs (tests, benchmarks).
import { hostname } from "node:os";
import { jobs } from "./jobs";
import { db } from "~/db.server";
import { resetWorkerTransport } from "./transport";

const workerId = `${hostname()}:${process.pid}`;
const only = process.env.WORKER_JOBS?.split(",").map((s) => s.trim()).filter(Boolean);
const active = jobs.filter((j) => !only || only.includes(j.name));
const nextRunAt = new Map<string, number>(active.map((j) => [j.name, 0]));
let stopping = false;
let peakRss = 0;
let peakHeap = 0;

async function loop() {
  console.log(`[worker ${workerId}] started: ${active.map((j) => j.name).join(", ")}`);
  while (!stopping) {
    let busy = false;
    for (const job of active) {
      if (stopping || Date.now() < nextRunAt.get(job.name)!) continue;
      let done = 0;
      try {
        done = await job.run({ workerId });
      } catch (error) {
        // A database or SMTP outage must not kill the worker: wait and try again.
        console.error(`[worker] ${job.name} failed: ${(error as Error).message ?? error}`);
      }
      if (done > 0) busy = true;
      const { rss, heapUsed } = process.memoryUsage();
      peakRss = Math.max(peakRss, rss);
      peakHeap = Math.max(peakHeap, heapUsed);
      nextRunAt.set(job.name, done > 0 ? 0 : Date.now() + job.everyMs);
    }
    if (!busy && !stopping) {
      const wait = Math.max(10, Math.min(...[...nextRunAt.values()].map((t) => t - Date.now())));
      await new Promise((r) => setTimeout(r, Math.min(wait, 1000)));
    }
  }
  await db.destroy();
  resetWorkerTransport(); // pooled SMTP connections would keep the process alive
  console.log(`[worker ${workerId}] stopped (peak heap ${Math.round(peakHeap / 2 ** 20)} MB, peak RSS ${Math.round(peakRss / 2 ** 20)} MB)`);
  process.exit(0);
}

for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, () => {
    stopping = true;
  });
}

void loop();
