import { db as defaultDb, type Db } from "~/db.server";

export type OutboxMail = {
  /** Unique per logical message, e.g. `verify:42:<token-hash>` or `alert:7:19:published`. */
  idempotencyKey: string;
  kind: string;
  to: string;
  subject: string;
  text: string;
  html?: string;
  headers?: Record<string, string>;
  runAt?: Date;
};

/**
 * Queues a message in the same transaction as the change that causes it. A second enqueue
 * with the same key is ignored, so retries of the causing request never duplicate mail.
 */
export async function enqueueMail(mail: OutboxMail, db: Db = defaultDb): Promise<void> {
  await db("outbox")
    .insert({
      idempotency_key: mail.idempotencyKey,
      kind: mail.kind,
      to_address: mail.to,
      subject: mail.subject,
      body_text: mail.text,
      body_html: mail.html ?? null,
      headers: JSON.stringify(mail.headers ?? {}),
      status: "queued",
      run_at: mail.runAt ?? new Date(),
    })
    .onConflict("idempotency_key")
    .ignore();
}

export type OutboxRow = {
  id: number;
  idempotency_key: string;
  kind: string;
  to_address: string;
  subject: string;
  body_text: string;
  body_html: string | null;
  headers: string;
  status: "queued" | "sending" | "sent" | "failed";
  attempts: number;
  run_at: Date;
  locked_until: Date | null;
  last_error: string | null;
  sent_at: Date | null;
  created_at: Date;
};

export const MAX_ATTEMPTS = 10;
export const CLAIM_LEASE_MS = 2 * 60_000;

/** Exponential backoff: 15 s, 30 s, 1 min … capped at 1 h. */
export function backoffMs(attempts: number): number {
  return Math.min(3600_000, 15_000 * 2 ** Math.max(0, attempts - 1));
}

/**
 * Claims up to `limit` due messages. SKIP LOCKED lets several workers claim disjoint sets;
 * ordering by the indexed (status, run_at, id) keeps one worker from locking every row.
 * A lease (locked_until) returns the job to the queue if the worker dies while sending.
 */
export async function claimBatch(limit: number, workerId: string, db = defaultDb): Promise<OutboxRow[]> {
  return db.transaction(async (trx) => {
    const now = new Date();
    const rows: OutboxRow[] = await trx("outbox")
      .where(function () {
        this.where({ status: "queued" }).andWhere("run_at", "<=", now);
      })
      .orWhere(function () {
        this.where({ status: "sending" }).andWhere("locked_until", "<", now);
      })
      .orderBy([{ column: "run_at" }, { column: "id" }])
      .limit(limit)
      .forUpdate()
      .skipLocked();
    if (rows.length === 0) return [];
    await trx("outbox")
      .whereIn(
        "id",
        rows.map((r) => r.id),
      )
      .update({
        status: "sending",
        locked_by: workerId,
        locked_until: new Date(now.getTime() + CLAIM_LEASE_MS),
        attempts: trx.raw("attempts + 1"),
      });
    return rows.map((r) => ({ ...r, attempts: r.attempts + 1 }));
  });
}

export async function markSent(id: number, db: Db = defaultDb) {
  await db("outbox").where({ id }).update({ status: "sent", sent_at: new Date(), locked_until: null, last_error: null });
}

export async function markFailedAttempt(row: OutboxRow, error: string, db: Db = defaultDb) {
  const giveUp = row.attempts >= MAX_ATTEMPTS;
  await db("outbox")
    .where({ id: row.id })
    .update({
      status: giveUp ? "failed" : "queued",
      run_at: new Date(Date.now() + backoffMs(row.attempts)),
      locked_until: null,
      last_error: error.slice(0, 2000),
    });
}

export async function requeueFailed(id: number, db: Db = defaultDb) {
  return db("outbox").where({ id, status: "failed" }).update({ status: "queued", attempts: 0, run_at: new Date(), last_error: null });
}
