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
  /** Claim order, 1 first … 9 last; by default from the kind (see priorityOf). */
  priority?: number;
};

/** Alerts go first, digests last; everything else in between. */
export function priorityOf(kind: string): number {
  return kind === "alert" ? 1 : kind === "digest" ? 9 : 5;
}

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
      priority: mail.priority ?? priorityOf(mail.kind),
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
export const BACKOFF_BASE_MS = 15_000;
export const BACKOFF_MAX_MS = 3600_000;

/** Several messages in one multi-row INSERT (digests); keys already queued are ignored. */
export async function enqueueMails(mails: OutboxMail[], db: Db = defaultDb): Promise<void> {
  const now = new Date();
  for (let i = 0; i < mails.length; i += 200) {
    const rows = mails.slice(i, i + 200).map((mail) => ({
      idempotency_key: mail.idempotencyKey,
      kind: mail.kind,
      to_address: mail.to,
      subject: mail.subject,
      body_text: mail.text,
      body_html: mail.html ?? null,
      headers: JSON.stringify(mail.headers ?? {}),
      status: "queued",
      run_at: mail.runAt ?? now,
      priority: mail.priority ?? priorityOf(mail.kind),
    }));
    if (rows.length) await db("outbox").insert(rows).onConflict("idempotency_key").ignore();
  }
}

/** Exponential backoff: 15 s, 30 s, 1 min … capped at 1 h (base and cap can be lowered in tests). */
export function backoffMs(attempts: number, baseMs = BACKOFF_BASE_MS, maxMs = BACKOFF_MAX_MS): number {
  return Math.min(maxMs, baseMs * 2 ** Math.max(0, attempts - 1));
}

export type ClaimOptions = { leaseMs?: number; /** Only mail of this priority or more urgent. */ maxPriority?: number };

/**
 * Claims up to `limit` due messages: first queued ones whose time has come (alerts before other
 * mail before digests), then ones whose sender's lease ran out (a worker that died while
 * sending). SKIP LOCKED lets several workers claim disjoint sets; each query walks an index in
 * its ORDER BY order ((status, priority, run_at, id) and (status, run_at, id)), so a worker
 * locks only the rows it reads and a second worker finds the next ones.
 */
export async function claimBatch(limit: number, workerId: string, db = defaultDb, opts: ClaimOptions = {}): Promise<OutboxRow[]> {
  return db.transaction(async (trx) => {
    const now = new Date();
    const fresh = trx("outbox").where({ status: "queued" }).andWhere("run_at", "<=", now);
    if (opts.maxPriority !== undefined) fresh.andWhere("priority", "<=", opts.maxPriority);
    const rows: OutboxRow[] = await fresh
      .orderBy([{ column: "priority" }, { column: "run_at" }, { column: "id" }])
      .limit(limit)
      .forUpdate()
      .skipLocked();
    if (rows.length < limit) {
      const stale: OutboxRow[] = await trx("outbox")
        .where({ status: "sending" })
        .andWhere("locked_until", "<", now)
        .orderBy([{ column: "run_at" }, { column: "id" }])
        .limit(limit - rows.length)
        .forUpdate()
        .skipLocked();
      rows.push(...stale);
    }
    if (rows.length === 0) return [];
    await trx("outbox")
      .whereIn(
        "id",
        rows.map((r) => r.id),
      )
      .update({
        status: "sending",
        locked_by: workerId,
        locked_until: new Date(now.getTime() + (opts.leaseMs ?? CLAIM_LEASE_MS)),
        attempts: trx.raw("attempts + 1"),
      });
    return rows.map((r) => ({ ...r, attempts: r.attempts + 1 }));
  });
}

/** Recorded right after the SMTP server accepts the message; only the claiming worker may. */
export async function markSent(id: number, db: Db = defaultDb, workerId?: string) {
  const q = db("outbox").where({ id, status: "sending" });
  if (workerId) q.andWhere({ locked_by: workerId });
  await q.update({ status: "sent", sent_at: new Date(), locked_until: null, last_error: null });
}

export async function markFailedAttempt(row: OutboxRow, error: string, db: Db = defaultDb, backoff: { baseMs?: number; maxMs?: number } = {}) {
  const giveUp = row.attempts >= MAX_ATTEMPTS;
  await db("outbox")
    .where({ id: row.id, status: "sending" })
    .update({
      status: giveUp ? "failed" : "queued",
      run_at: new Date(Date.now() + backoffMs(row.attempts, backoff.baseMs, backoff.maxMs)),
      locked_until: null,
      last_error: error.slice(0, 2000),
    });
}

export async function requeueFailed(id: number, db: Db = defaultDb) {
  return db("outbox").where({ id, status: "failed" }).update({ status: "queued", attempts: 0, run_at: new Date(), last_error: null });
}

// ---------------------------------------------------------------------------------------------
// Staff view

export async function outboxCounts(db: Db = defaultDb) {
  const rows = await db("outbox").select("status", "kind").count({ n: "*" }).sum({ attempts: "attempts" }).groupBy("status", "kind");
  return rows.map((r: Record<string, any>) => ({ status: r.status as OutboxRow["status"], kind: r.kind as string, count: Number(r.n), attempts: Number(r.attempts ?? 0) }));
}

/** Messages still waiting after a failed attempt (queued with an error), and failed ones. */
export async function listTroubledMail(limit = 50, db: Db = defaultDb) {
  return db("outbox")
    .select("id", "idempotency_key", "kind", "to_address", "subject", "status", "attempts", "run_at", "last_error", "created_at")
    .where((q) => q.where({ status: "failed" }).orWhere((w) => w.where({ status: "queued" }).whereNotNull("last_error")))
    .orderBy("id", "desc")
    .limit(limit);
}

export async function listRecentMail(limit = 30, db: Db = defaultDb) {
  return db("outbox").select("id", "kind", "to_address", "subject", "status", "attempts", "sent_at", "created_at").orderBy("id", "desc").limit(limit);
}
