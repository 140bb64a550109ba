// Notices: draft → publish → amend → cancel / supersede / expire, each with its audit row;
// optimistic locking; the append-only audit trail; numbering under real concurrent transactions.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db.server";
import {
  cancelNotice,
  createDraft,
  createSupersedingDraft,
  expireDueNotices,
  getNotice,
  listAudit,
  listInForce,
  NoticeError,
  publishNotice,
  updateNotice,
} from "~/models/notice.server";
import { makeHarbour, makeStaff, noticeInput } from "./notices-fixtures";

let harbour: { id: number; seriesCode: string };
let staff: Awaited<ReturnType<typeof makeStaff>>;
const at = (s: string) => new Date(s);

beforeAll(async () => {
  harbour = await makeHarbour();
  staff = await makeStaff();
});
afterAll(async () => {
  await db.destroy();
});

async function rejects(p: Promise<unknown>): Promise<NoticeError> {
  try {
    await p;
  } catch (e) {
    if (e instanceof NoticeError) return e;
    throw e;
  }
  throw new Error("expected a NoticeError");
}

describe("notice lifecycle", () => {
  it("drafts, publishes with a number, amends, cancels — each step audited", async () => {
    const draft = await createDraft(harbour.id, noticeInput(), staff.officer, { at: at("2026-11-30T10:00:00Z") });
    expect(draft.status).toBe("draft");
    expect(draft.seriesNumber).toBeNull();
    expect(draft.parts[0]!.crs).toBe("EPSG:4230");
    expect(draft.parts[0]!.positionsText.split("\n")[0]).toBe("55°12.36′N 003°02.20′E");

    // An officer may not publish.
    const denied = await rejects(publishNotice(draft.id, draft.version, staff.officer, { at: at("2026-11-30T11:00:00Z") }));
    expect(denied.status).toBe(403);

    const published = await publishNotice(draft.id, draft.version, staff.harbourmaster, { at: at("2026-11-30T11:00:00Z") });
    expect(published.status).toBe("in_force");
    expect(published.seriesNumber).toMatch(new RegExp(`^${harbour.seriesCode} 2026/\\d{3}$`));
    expect(published.publishedAt).toBe("2026-11-30T11:00:00.000Z");
    expect(published.version).toBe(draft.version + 1);

    // A stale version is refused with 409 and nothing changes.
    const stale = await rejects(updateNotice(draft.id, draft.version, noticeInput({ title: "Stale" }), staff.harbourmaster));
    expect(stale.status).toBe(409);
    expect(stale.field).toBe("version");
    expect((await getNotice(draft.id))!.title).toBe("Dredging in the inner basin");

    // Officers cannot amend a notice in force; the harbourmaster can, keeping the number.
    expect((await rejects(updateNotice(draft.id, published.version, noticeInput({ title: "X" }), staff.officer))).status).toBe(403);
    const amended = await updateNotice(draft.id, published.version, noticeInput({ title: "Dredging in the inner basin, extended", validUntil: "2026-12-29T18:00" }), staff.harbourmaster, {
      at: at("2026-12-05T09:00:00Z"),
    });
    expect(amended.seriesNumber).toBe(published.seriesNumber);
    expect(amended.validUntil).toBe("2026-12-29T18:00:00.000Z");

    const cancelled = await cancelNotice(draft.id, amended.version, "Dredging finished early.", staff.harbourmaster, { at: at("2026-12-10T12:00:00Z") });
    expect(cancelled.status).toBe("cancelled");
    expect(cancelled.cancellationReason).toBe("Dredging finished early.");
    // Still readable.
    expect((await getNotice(draft.id))!.title).toContain("extended");

    const trail = await listAudit(draft.id);
    expect(trail.map((a) => a.action)).toEqual(["created", "published", "amended", "cancelled"]);
    expect(trail.map((a) => a.version)).toEqual([1, 2, 3, 4]);
    expect(trail[2]!.changes.title).toEqual(["Dredging in the inner basin", "Dredging in the inner basin, extended"]);
    expect(trail[2]!.actorUserId).toBe(staff.harbourmaster.id);
    // Every version can be read back from the trail.
    expect(trail[1]!.snapshot.title).toBe("Dredging in the inner basin");
    expect(trail[3]!.reason).toBe("Dredging finished early.");
    // Cancelling twice is refused.
    expect((await rejects(cancelNotice(draft.id, cancelled.version, "again", staff.harbourmaster))).status).toBe(409);
  });

  it("saving an unchanged form is not a new version", async () => {
    const d = await createDraft(harbour.id, noticeInput(), staff.officer);
    const same = await updateNotice(d.id, d.version, noticeInput(), staff.harbourmaster);
    expect(same.version).toBe(d.version);
    expect((await listAudit(d.id)).map((a) => a.action)).toEqual(["created"]);
    const changed = await updateNotice(d.id, d.version, noticeInput({ charts: "KS 102" }), staff.harbourmaster);
    expect(changed.version).toBe(d.version + 1);
    expect((await listAudit(d.id)).at(-1)!.changes.charts).toEqual(["KS 101", "KS 102"]);
  });

  it("refuses to change the audit trail", async () => {
    const [row] = await db("notice_audit").select("id").limit(1);
    await expect(db("notice_audit").where({ id: row.id }).update({ action: "forged" })).rejects.toThrow(/append-only/);
    await expect(db("notice_audit").where({ id: row.id }).delete()).rejects.toThrow(/append-only/);
  });

  it("needs a reason to cancel", async () => {
    const d = await createDraft(harbour.id, noticeInput(), staff.officer);
    const p = await publishNotice(d.id, d.version, staff.harbourmaster);
    const e = await rejects(cancelNotice(d.id, p.version, "  ", staff.harbourmaster));
    expect(e.field).toBe("reason");
    expect((await getNotice(d.id))!.status).toBe("in_force");
    await cancelNotice(d.id, p.version, "Test over", staff.harbourmaster);
  });

  it("supersedes: publishing the new notice cancels the old one in the same transaction", async () => {
    const d = await createDraft(harbour.id, noticeInput({ title: "Light unlit" }), staff.officer);
    const old = await publishNotice(d.id, d.version, staff.harbourmaster);
    const next = await createSupersedingDraft(old.id, staff.harbourmaster);
    expect(next.supersedesNoticeId).toBe(old.id);
    expect((await getNotice(old.id))!.status).toBe("in_force"); // not until it is published
    const fixed = await updateNotice(next.id, next.version, noticeInput({ title: "Light unlit (corrected position)" }), staff.harbourmaster);
    // updateNotice keeps the supersedes reference
    expect(fixed.supersedesNoticeId).toBe(old.id);
    const pub = await publishNotice(next.id, fixed.version, staff.harbourmaster);
    const oldNow = (await getNotice(old.id))!;
    expect(oldNow.status).toBe("superseded");
    expect(oldNow.supersededByNoticeId).toBe(pub.id);
    expect(oldNow.supersededBySeriesNumber).toBe(pub.seriesNumber);
    expect(pub.supersedesSeriesNumber).toBe(old.seriesNumber);
    expect((await listAudit(old.id)).map((a) => a.action)).toEqual(["created", "published", "superseded"]);
  });

  it("a notice past its end reads as expired at once, and the worker's expiry records it", async () => {
    const d = await createDraft(harbour.id, noticeInput({ title: "Regatta", validFrom: "2026-12-02T12:00", validUntil: "2026-12-02T17:00" }), staff.officer);
    const p = await publishNotice(d.id, d.version, staff.harbourmaster, { at: at("2026-12-01T09:00:00Z") });
    const before = at("2026-12-02T16:00:00Z");
    const after = at("2026-12-02T17:30:00Z");
    expect((await getNotice(p.id, db, before))!.effectiveStatus).toBe("in_force");
    expect((await getNotice(p.id, db, after))!.effectiveStatus).toBe("expired");
    expect((await listInForce(harbour.id, db, before)).map((n) => n.id)).toContain(p.id);
    expect((await listInForce(harbour.id, db, after)).map((n) => n.id)).not.toContain(p.id);
    expect((await getNotice(p.id))!.status).toBe("in_force"); // not yet recorded

    const n = await expireDueNotices(after);
    expect(n).toBeGreaterThanOrEqual(1);
    const expired = (await getNotice(p.id))!;
    expect(expired.status).toBe("expired");
    expect(expired.expiredAt).toBe("2026-12-02T17:00:00.000Z");
    expect((await listAudit(p.id)).at(-1)!.action).toBe("expired");
    expect(await expireDueNotices(after)).toBe(0);
  });

  it("keeps the number sequence gap-free when a publish fails", async () => {
    const a = await createDraft(harbour.id, noticeInput(), staff.officer);
    const pa = await publishNotice(a.id, a.version, staff.harbourmaster);
    const b = await createDraft(harbour.id, noticeInput(), staff.officer);
    // A stale publish fails before numbering; the next good one gets the very next number.
    await rejects(publishNotice(b.id, b.version + 7, staff.harbourmaster));
    const pb = await publishNotice(b.id, b.version, staff.harbourmaster);
    expect(pb.number).toBe(pa.number! + 1);
  });
});

describe("numbering under concurrency", () => {
  it("ten parallel publishes give ten distinct consecutive numbers", async () => {
    const h = await makeHarbour(); // a fresh series: numbers start at 1
    const drafts = [];
    for (let i = 0; i < 10; i++) drafts.push(await createDraft(h.id, noticeInput({ title: `Parallel ${i}` }), staff.officer));
    // Ten real transactions at once, each on its own pooled connection.
    const results = await Promise.all(drafts.map((d) => publishNotice(d.id, d.version, staff.harbourmaster)));
    const numbers = results.map((r) => r.number!).sort((x, y) => x - y);
    expect(numbers).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    const year = results[0]!.year!;
    expect(new Set(results.map((r) => r.seriesNumber)).size).toBe(10);
    const counter = await db("notice_number_counters").where({ harbour_id: h.id, year }).first();
    expect(counter.last_number).toBe(10);
  });

  it("two publishes of the same draft: exactly one wins, the other gets a clear 409", async () => {
    const d = await createDraft(harbour.id, noticeInput(), staff.officer);
    const settled = await Promise.allSettled([publishNotice(d.id, d.version, staff.harbourmaster), publishNotice(d.id, d.version, staff.harbourmaster)]);
    expect(settled.filter((s) => s.status === "fulfilled")).toHaveLength(1);
    const failed = settled.find((s) => s.status === "rejected") as PromiseRejectedResult;
    expect(failed.reason).toBeInstanceOf(NoticeError);
    expect((failed.reason as NoticeError).status).toBe(409);
  });
});

describe("geometry outside the harbour", () => {
  it("is a warning the officer can accept", async () => {
    const far = { "parts.0.kind": "point", "parts.0.crs": "EPSG:4326", "parts.0.positions": "56°00.00′N 004°00.00′E" };
    const e = await rejects(createDraft(harbour.id, noticeInput(far), staff.officer));
    expect(e.field).toBe("acceptOutside");
    const ok = await createDraft(harbour.id, noticeInput({ ...far, acceptOutside: "on" }), staff.officer);
    expect(ok.outsideBoundaryAccepted).toBe(true);
  });
});
