// The background worker: delivers the outbox and runs scheduled jobs. Several can run at once.
import { hostname } from "node:os";
import { runOutboxOnce } from "./outbox";
import { db } from "~/db.server";

const workerId = `${hostname()}:${process.pid}`;
const IDLE_POLL_MS = Number(process.env.WORKER_POLL_MS ?? 1000);
let stopping = false;

async function loop() {
  console.log(`[worker ${workerId}] started`);
  while (!stopping) {
    let sent = 0;
    try {
      sent = await runOutboxOnce(workerId);
    } catch (error) {
      // A database outage must not kill the worker: wait and try again.
      console.error(`[worker] cycle failed: ${(error as Error).message ?? error}`);
    }
    if (sent === 0) await new Promise((r) => setTimeout(r, IDLE_POLL_MS));
  }
  await db.destroy();
  console.log(`[worker ${workerId}] stopped`);
}

for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, () => {
    stopping = true;
  });
}

void loop();
