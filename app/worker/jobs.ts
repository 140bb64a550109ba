// The worker's jobs. To add one, append an entry: `run` returns how much work it did (0 = idle),
// `everyMs` is the pause after an idle run. A job that did work runs again on the next cycle.
import { lapseUnconfirmed } from "~/models/subscription.server";
import { runDigestBatch } from "~/services/digests.server";
import { expireDueNotices } from "~/models/notice.server";
import { runOutboxOnce } from "./outbox";
import { cleanupExpiredUploads } from "~/models/photo.server";
import { closeReportsOfPublishedNotices } from "~/models/report.server";
import { housekeeping } from "~/models/housekeeping.server";

export type WorkerJob = { name: string; everyMs: number; run: (ctx: { workerId: string }) => Promise<number> };

const num = (v: string | undefined, fallback: number) => (v && Number.isFinite(Number(v)) ? Number(v) : fallback);

// While this worker is building digests, it sends only mail more urgent than digests (alerts,
// account and report mail), so the build finishes first and the digests go out after it.
let buildingDigestsUntil = 0;

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
        maxPriority: Date.now() < buildingDigestsUntil ? 5 : undefined,
      }),
  },
  {
    name: "digests",
    everyMs: num(process.env.DIGEST_POLL_MS, 30_000),
    run: async () => {
      const n = await runDigestBatch();
      // Nothing left to build: digests may go out at once.
      buildingDigestsUntil = n > 0 ? Date.now() + 5000 : 0;
      return n;
    },
  },
  { name: "expire-notices", everyMs: num(process.env.EXPIRY_POLL_MS, 15_000), run: () => expireDueNotices() },
  { name: "lapse-unconfirmed-subscriptions", everyMs: 10 * 60_000, run: () => lapseUnconfirmed() },
  // Photos uploaded but never attached to a report (abandoned forms, failed submits).
  { name: "cleanup-uploads", everyMs: num(process.env.UPLOAD_CLEANUP_MS, 10 * 60_000), run: async () => (await cleanupExpiredUploads()).removed },
  // Reports linked to a notice that has been published are closed by it (with the reporter's mail).
  { name: "close-reports-by-notice", everyMs: num(process.env.REPORT_SYNC_MS, 5_000), run: () => closeReportsOfPublishedNotices() },
  // Housekeeping: expired sessions, sign-in failures past the throttle window, spent rate-limit rows.
  { name: "housekeeping", everyMs: 60 * 60_000, run: () => housekeeping() },
];
