// The worker's jobs. To add one, append an entry: `run` returns how much work it did (0 = idle),
// `everyMs` is the pause after an idle run. A job that did work runs again on the next cycle.
import { lapseUnconfirmed } from "~/models/subscription.server";
import { runDigestBatch } from "~/services/digests.server";
import { expireDueNotices } from "~/models/notice.server";
import { runOutboxOnce } from "./outbox";

export type WorkerJob = { name: string; everyMs: number; run: (ctx: { workerId: string }) => Promise<number> };

const num = (v: string | undefined, fallback: number) => (v && Number.isFinite(Number(v)) ? Number(v) : fallback);

export const jobs: WorkerJob[] = [
  {
    name: "outbox",
    everyMs: num(process.env.WORKER_POLL_MS, 1000),
    run: ({ workerId }) =>
      runOutboxOnce(workerId, {
        batchSize: num(process.env.OUTBOX_BATCH_SIZE, 20),
        leaseMs: num(process.env.OUTBOX_LEASE_MS, 120_000),
        backoffBaseMs: num(process.env.OUTBOX_BACKOFF_BASE_MS, 15_000),
        backoffMaxMs: num(process.env.OUTBOX_BACKOFF_MAX_MS, 3_600_000),
      }),
  },
  { name: "digests", everyMs: num(process.env.DIGEST_POLL_MS, 30_000), run: () => runDigestBatch() },
  { name: "expire-notices", everyMs: num(process.env.EXPIRY_POLL_MS, 15_000), run: () => expireDueNotices() },
  { name: "lapse-unconfirmed-subscriptions", everyMs: 10 * 60_000, run: () => lapseUnconfirmed() },
];
