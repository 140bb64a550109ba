// Building digests: for each confirmed subscription whose digest slot has come, the changes to
// notices in its window that concern it, as one outbox message keyed by (subscription, period).
// Works through due subscriptions in batches under FOR UPDATE SKIP LOCKED, so several workers
// share the work and memory stays bounded by the batch, not by the number of subscribers.
import { db as defaultDb, type Db } from "~/db.server";
import { areaBBox, bboxesIntersect, noticeBBox, subscriptionMatchesNotice, type BBox } from "~/lib/subscriptions/matching";
import { positionLines, summariseChanges, type ChangeKind, type DigestItem } from "~/lib/subscriptions/digest";
import { digestPeriodKey, nextDigestAt } from "~/lib/subscriptions/schedule";
import { enqueueMails, type OutboxMail } from "~/models/outbox.server";
import { getHarbourForMail, loadNoticesForMail, rowToSubscription, type HarbourForMail, type NoticeForMail, type Subscription } from "~/models/subscription.server";
import { digestMail, type DigestFragments, type MailParts } from "./subscription-mail.server";

export const DIGEST_BATCH_SIZE = 250;

type Change = { noticeId: number; kind: ChangeKind; at: Date };

type PreparedNotice = { notice: NoticeForMail; bbox: BBox | null; positions: string[] };

/** Notices read once per run and reused by every subscription of every batch. */
class NoticeCache {
  private map = new Map<number, PreparedNotice | null>();
  constructor(private readonly db: Db) {}
  async load(ids: number[]) {
    const missing = [...new Set(ids)].filter((id) => !this.map.has(id));
    for (let i = 0; i < missing.length; i += 500) {
      const chunk = missing.slice(i, i + 500);
      const got = await loadNoticesForMail(chunk, this.db);
      for (const id of chunk) {
        const n = got.get(id);
        this.map.set(id, n ? { notice: n, bbox: n.parts.length ? noticeBBox(n) : null, positions: positionLines(n.parts) } : null);
      }
    }
    if (this.map.size > 20_000) this.map.clear(); // bound memory on very long runs
  }
  get(id: number) {
    return this.map.get(id) ?? null;
  }
}

/** The digest items for one subscription from the changes in its window (pure apart from the cache). */
export function itemsFor(sub: Subscription, changes: Change[], from: Date, to: Date, cache: NoticeCache): DigestItem[] {
  const byNotice = new Map<number, { kinds: ChangeKind[]; at: Date }>();
  for (const c of changes) {
    if (c.at < from || c.at >= to) continue;
    const e = byNotice.get(c.noticeId) ?? { kinds: [], at: c.at };
    e.kinds.push(c.kind);
    if (c.at > e.at) e.at = c.at;
    byNotice.set(c.noticeId, e);
  }
  const subBox = areaBBox(sub.area);
  const items: DigestItem[] = [];
  for (const [noticeId, e] of byNotice) {
    const p = cache.get(noticeId);
    if (!p) continue;
    if (subBox && p.bbox && !bboxesIntersect(subBox, p.bbox)) continue; // cheap prefilter
    if (!subscriptionMatchesNotice(sub, p.notice)) continue;
    items.push({ notice: p.notice, change: summariseChanges(e.kinds), at: e.at, positions: p.positions });
  }
  return items;
}

async function changesBetween(from: Date, to: Date, db: Db): Promise<Change[]> {
  const rows = await db("notice_changes").select("notice_id", "kind", "occurred_at").where("occurred_at", ">=", from).where("occurred_at", "<", to).orderBy(["occurred_at", "id"]);
  return rows.map((r) => ({ noticeId: r.notice_id, kind: r.kind, at: r.occurred_at }));
}

const harbourCache = new Map<number, HarbourForMail>();
async function harbourOf(id: number, db: Db): Promise<HarbourForMail> {
  let h = harbourCache.get(id);
  if (!h) {
    h = (await getHarbourForMail(id, db))!;
    harbourCache.set(id, h);
  }
  return h;
}

/**
 * Builds one batch of due digests in one transaction; returns how many subscriptions it handled
 * (0 when none are due). The outbox rows, the digest_runs rows and the moved schedule commit
 * together, so a crash re-does the whole batch and never sends a period twice.
 */
export async function runDigestBatch(opts: { now?: Date; batchSize?: number; db?: Db } = {}): Promise<number> {
  const now = opts.now ?? new Date();
  const root = opts.db ?? defaultDb;
  return root.transaction(async (trx) => {
    const rows = await trx("subscriptions")
      .select("*")
      .where({ status: "confirmed" })
      .where("next_digest_at", "<=", now)
      .orderBy([{ column: "next_digest_at" }, { column: "id" }])
      .limit(opts.batchSize ?? DIGEST_BATCH_SIZE)
      .forUpdate()
      .skipLocked();
    if (rows.length === 0) return 0;
    const subs = rows.map(rowToSubscription);
    const windows = subs.map((s) => ({ from: s.lastDigestAt ?? s.confirmedAt ?? s.createdAt, to: s.nextDigestAt! }));
    const minFrom = new Date(Math.min(...windows.map((w) => w.from.getTime())));
    const maxTo = new Date(Math.max(...windows.map((w) => w.to.getTime())));
    const changes = await changesBetween(minFrom, maxTo, trx);
    const cache = new NoticeCache(trx);
    await cache.load(changes.map((c) => c.noticeId));

    // Every subscription with the same schedule and slot shares its period key and next slot
    // (luxon is the slow part of building a digest; 10,000 subscriptions have few schedules).
    const scheduleCache = new Map<string, { periodKey: string; next: Date | null }>();
    const fragments: DigestFragments = new Map();
    const mails: OutboxMail[] = [];
    const runs: Record<string, unknown>[] = [];
    const moves = new Map<string, number[]>();
    for (let i = 0; i < subs.length; i++) {
      const sub = subs[i];
      const w = windows[i];
      const harbour = await harbourOf(sub.harbourId, trx);
      const cadence = sub.digest.cadence === "weekly" ? "weekly" : "daily";
      const sk = `${harbour.timeZone}|${sub.digest.cadence}|${sub.digest.localTime}|${sub.digest.weekday}|${w.to.getTime()}`;
      let sched = scheduleCache.get(sk);
      if (!sched) {
        // A worker that was down for days sends one digest covering the whole gap, then resumes.
        sched = { periodKey: digestPeriodKey(cadence, harbour.timeZone, w.to), next: nextDigestAt(sub.digest, harbour.timeZone, new Date(Math.max(w.to.getTime(), now.getTime()))) };
        scheduleCache.set(sk, sched);
      }
      const { periodKey, next } = sched;
      const items = sub.digest.cadence === "none" ? [] : itemsFor(sub, changes, w.from, w.to, cache);
      const key = `digest:${sub.id}:${periodKey}`;
      if (items.length > 0) {
        const mail = digestMail(sub, harbour, items, w, fragments);
        mails.push({ idempotencyKey: key, kind: "digest", to: sub.email, ...mail });
      }
      runs.push({ subscription_id: sub.id, period_key: periodKey, window_from: w.from, window_to: w.to, item_count: items.length, outbox_key: items.length ? key : null });
      const moveKey = `${w.to.getTime()}|${next ? next.getTime() : ""}`;
      moves.set(moveKey, [...(moves.get(moveKey) ?? []), sub.id]);
    }
    await enqueueMails(mails, trx);
    for (let i = 0; i < runs.length; i += 500) await trx("digest_runs").insert(runs.slice(i, i + 500)).onConflict(["subscription_id", "period_key"]).ignore();
    for (const [k, ids] of moves) {
      const [last, next] = k.split("|");
      await trx("subscriptions")
        .whereIn("id", ids)
        .update({ last_digest_at: new Date(Number(last)), next_digest_at: next ? new Date(Number(next)) : null });
    }
    return subs.length;
  });
}

/** Runs batches until no digest is due (or `maxBatches`); returns subscriptions handled. */
export async function runDueDigests(opts: { now?: Date; batchSize?: number; maxBatches?: number; db?: Db } = {}): Promise<number> {
  let total = 0;
  for (let b = 0; b < (opts.maxBatches ?? Infinity); b++) {
    const n = await runDigestBatch(opts);
    total += n;
    if (n === 0) break;
  }
  return total;
}

/** What the next digest would say if it were built now (staff preview; writes nothing). */
export async function previewNextDigest(sub: Subscription, now = new Date(), db: Db = defaultDb): Promise<{ items: DigestItem[]; mail: MailParts; window: { from: Date; to: Date } }> {
  const harbour = await harbourOf(sub.harbourId, db);
  const from = sub.lastDigestAt ?? sub.confirmedAt ?? sub.createdAt;
  const window = { from, to: now };
  const changes = await changesBetween(from, now, db);
  const cache = new NoticeCache(db);
  await cache.load(changes.map((c) => c.noticeId));
  const items = itemsFor(sub, changes, from, now, cache);
  return { items, mail: digestMail(sub, harbour, items, window), window };
}
