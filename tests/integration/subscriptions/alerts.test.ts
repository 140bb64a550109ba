// Urgent alerts through the real publishing path (notices model → onNoticeEvent → outbox →
// worker → SMTP fake over a socket), one-click unsubscribe, and the subscribe/confirm/manage
// routes with their bad-input answers.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db.server";
import { env } from "~/env.server";
import { direct } from "~/lib/geo/geodesy";
import { parsePolygon } from "~/lib/subscriptions/area";
import { BAD_TOKEN_MESSAGE, signToken } from "~/lib/subscriptions/tokens";
import { cancelNotice, publishNotice, updateNotice } from "~/models/notice.server";
import { explainAlertPrefilter, getSubscription, lapseUnconfirmed, type HarbourForMail } from "~/models/subscription.server";
import { onNoticeEvent } from "~/services/notice-events.server";
import { runOutboxOnce } from "~/worker/outbox";
import * as subscribeRoute from "~/routes/subscribe";
import * as confirmRoute from "~/routes/subscribe.confirm";
import * as manageRoute from "~/routes/subscriptions.manage";
import * as unsubscribeRoute from "~/routes/unsubscribe";
import * as staffMail from "~/routes/staff.mail";
import * as accountSubs from "~/routes/account.subscriptions";
import { allMail, linkIn, waitForMail, type CapturedMail } from "../../support/mail";
import { call, signedInAs } from "../../support/routes";
import { harbourForMail, makeHarbour, makeStaff, noticeInput, pointPart, publish, subscribe, tag } from "./fixtures";

let harbour: HarbourForMail;
let staff: Awaited<ReturnType<typeof makeStaff>>;

beforeAll(async () => {
  harbour = await harbourForMail((await makeHarbour()).id);
  staff = await makeStaff();
});
afterAll(async () => {
  await db.destroy();
});

/** Runs the outbox until it is empty (in-process, same code as the worker). */
async function deliverAll() {
  while ((await runOutboxOnce("alerts-test")) > 0);
}

const mailTo = (addr: string) => allMail().filter((m) => m.recipients.includes(addr));
// Raw header lines, unfolded (RFC 5322 §2.2.3): nodemailer folds long ones.
const header = (m: CapturedMail, key: string) => (m.headerLines.find((h) => h.key === key)?.line ?? "").replace(/\r?\n[ \t]+/g, " ");

// The buoy: 55°12.30′N 003°01.80′E (invented waters, DEMO.md).
const BUOY = { lat: 55 + 12.3 / 60, lon: 3 + 1.8 / 60 };
const urgentBuoyNotice = (validFrom: Date) => ({
  title: "KS3 buoy off position",
  generalType: "aids_to_navigation_changes",
  detailTypes: ["51"],
  restrictions: [],
  urgency: "urgent",
  validFrom: validFrom.toISOString(),
  validUntil: "",
  untilFurtherNotice: "on",
  locality: "Kestrel Sound, approach channel",
  body: "KS3 starboard-hand buoy reported 0.08 M east of its charted position. Navigate with caution.",
  ...pointPart("55°12.30′N 003°01.80′E"),
});

describe("urgent alerts", () => {
  const t = tag();
  const addr = (who: string) => `${who}-${t}@alerts.test`;
  const ids: Record<string, number> = {};

  it("publishing an urgent notice sends exactly one alert to each matching confirmed subscriber and none to the rest", async () => {
    const near = direct(BUOY.lat, BUOY.lon, 0, 0.5 * 1852);
    // 1.27 M away on 045°: inside the 1 M circle's bounding box (0.9 M north and east), outside the circle.
    const diagonal = direct(BUOY.lat, BUOY.lon, 45, 1.27 * 1852);
    const box = parsePolygon("55°13′N 3°00′E\n55°13′N 3°04′E\n55°11′N 3°04′E\n55°11′N 3°00′E");
    const circle = (c: { lat: number; lon: number }, radiusNm: number) => ({ kind: "circle" as const, centre: { lat: c.lat, lon: c.lon }, radiusNm });
    ids.circle = await subscribe(harbour, addr("circle"), circle(near, 1));
    ids.polygon = await subscribe(harbour, addr("polygon"), box);
    ids.harbour = await subscribe(harbour, addr("harbour"), { kind: "harbour" });
    ids.diagonal = await subscribe(harbour, addr("diagonal"), circle(diagonal, 1));
    ids.pending = await subscribe(harbour, addr("pending"), { kind: "harbour" }, { status: "pending" });
    ids.ended = await subscribe(harbour, addr("ended"), { kind: "harbour" }, { status: "ended" });
    ids.noAlerts = await subscribe(harbour, addr("noalerts"), { kind: "harbour" }, { urgentAlerts: false, digest: { cadence: "daily", localTime: "07:00", weekday: null } });
    ids.otherType = await subscribe(harbour, addr("othertype"), box, { types: ["works"] });
    ids.far = await subscribe(harbour, addr("far"), circle({ lat: 55.25, lon: 3.15 }, 0.5));

    const notice = await publish(harbour.id, staff.harbourmaster, urgentBuoyNotice(new Date(Date.now() - 60_000)));
    const keys = (await db("outbox").where("idempotency_key", "like", `alert:%:${notice.id}:%`).pluck("idempotency_key")).sort();
    expect(keys).toEqual([ids.circle, ids.polygon, ids.harbour].map((id) => `alert:${id}:${notice.id}:published:${notice.version}`).sort());

    // Calling the hook again for the same change queues nothing new (idempotency keys).
    await db.transaction((trx) => onNoticeEvent(trx, { kind: "published", noticeId: notice.id }));
    expect(await db("outbox").where("idempotency_key", "like", `alert:%:${notice.id}:%`).count({ n: "*" })).toEqual([{ n: 3 }]);

    await deliverAll();
    for (const who of ["circle", "polygon", "harbour"]) {
      const m = await waitForMail({ to: addr(who), subject: "KS3 buoy off position" });
      expect(m.subject).toBe(`URGENT: ${notice.seriesNumber} KS3 buoy off position`);
      expect(mailTo(addr(who))).toHaveLength(1);
    }
    for (const who of ["diagonal", "pending", "ended", "noalerts", "othertype", "far"]) expect(mailTo(addr(who))).toHaveLength(0);

    const m = mailTo(addr("circle"))[0];
    expect(m.text).toContain("55°12.30′N 003°01.80′E");
    expect(linkIn(m, `/notices/${notice.id}`)).toBe(`${env().APP_URL}/notices/${notice.id}`);
    expect(m.html).toContain("55°12.30′N 003°01.80′E");
    expect(header(m, "list-unsubscribe")).toMatch(/^List-Unsubscribe: <http:\/\/127\.0\.0\.1:3000\/unsubscribe\?token=[\w.-]+>, <mailto:unsubscribe@tidewire\.test\?subject=unsubscribe%20\d+>$/);
    expect(header(m, "list-unsubscribe-post")).toBe("List-Unsubscribe-Post: List-Unsubscribe=One-Click");
    expect(header(m, "message-id")).toBe(`Message-ID: <alert.${ids.circle}.${notice.id}.published.${notice.version}@tidewire.outbox>`);
  });

  it("prefilters with the SPATIAL index on the subscription area", async () => {
    // Enough rows that a full scan is not the cheaper plan.
    const rows = Array.from({ length: 300 }, (_, i) => ({ kind: "circle" as const, centre: { lat: 55.16 + (i % 20) * 0.005, lon: 2.94 + Math.floor(i / 20) * 0.014 }, radiusNm: 0.2 }));
    for (const area of rows) await subscribe(harbour, `bulk-${t}@alerts.test`, area, { urgentAlerts: false });
    await db.raw("ANALYZE TABLE subscriptions");
    const plan = await explainAlertPrefilter([3.0, 55.2, 3.01, 55.21]);
    expect(plan.map((r) => r.key)).toContain("subscriptions_area_spatial");
  });

  it("one-click unsubscribe (RFC 8058) ends the subscription in one POST without session or Origin", async () => {
    const m = mailTo(addr("circle"))[0];
    const url = new URL(/<(http[^>]+)>/.exec(header(m, "list-unsubscribe"))![1]);
    const res = await call(unsubscribeRoute.action, { path: url.pathname + url.search, method: "POST", body: "List-Unsubscribe=One-Click", headers: { "Content-Type": "application/x-www-form-urlencoded" } });
    expect(res.status).toBe(200);
    expect(res.data).toMatchObject({ done: true });
    expect((await getSubscription(ids.circle))!.status).toBe("ended");
    // Again: still fine, still ended.
    expect((await call(unsubscribeRoute.action, { path: url.pathname + url.search, method: "POST", body: "List-Unsubscribe=One-Click", headers: { "Content-Type": "application/x-www-form-urlencoded" } })).status).toBe(200);

    // The amendment reaches the two remaining matching subscribers, not the one who left.
    const notice = (await db("notices").where({ title: "KS3 buoy off position", harbour_id: harbour.id }).first())!;
    const amended = await updateNotice(notice.id, notice.version, noticeInput({ ...urgentBuoyNotice(new Date(notice.valid_from)), body: "KS3 now reported 0.10 M east." }), { id: staff.harbourmaster.id, role: "harbourmaster" });
    const keys = (await db("outbox").where("idempotency_key", "like", `alert:%:${notice.id}:amended:%`).pluck("idempotency_key")).sort();
    expect(keys).toEqual([ids.polygon, ids.harbour].map((id) => `alert:${id}:${notice.id}:amended:${amended.version}`).sort());
    const cancelled = await cancelNotice(notice.id, amended.version, "KS3 returned to station.", { id: staff.harbourmaster.id, role: "harbourmaster" });
    await deliverAll();
    const c = await waitForMail({ to: addr("harbour"), subject: /^CANCELLED/ });
    expect(c.text).toContain("KS3 returned to station.");
    expect(await db("outbox").where({ idempotency_key: `alert:${ids.harbour}:${notice.id}:cancelled:${cancelled.version}` }).first("status")).toEqual({ status: "sent" });
    expect(mailTo(addr("circle"))).toHaveLength(1);
  });

  it("a routine notice sends no alert", async () => {
    const n = await publish(harbour.id, staff.harbourmaster, { ...urgentBuoyNotice(new Date(Date.now() - 60_000)), title: "Routine works", urgency: "routine" });
    expect(await db("outbox").where("idempotency_key", "like", `alert:%:${n.id}:%`).count({ n: "*" })).toEqual([{ n: 0 }]);
  });

  it("refuses forged, wrong-purpose and expired tokens with one message that reveals nothing", async () => {
    const secret = env().SESSION_SECRET;
    const forgedKnown = signToken("x".repeat(40), "unsubscribe", ids.polygon);
    const forgedUnknown = signToken("x".repeat(40), "unsubscribe", 99_999_999);
    const wrongPurpose = signToken(secret, "manage", ids.polygon);
    const expired = signToken(secret, "unsubscribe", ids.polygon, Date.now() - 91 * 24 * 3600_000);
    const unknownButSigned = signToken(secret, "unsubscribe", 99_999_999);
    const answers = [];
    for (const tok of [forgedKnown, forgedUnknown, wrongPurpose, expired, unknownButSigned, "", "%00%0d%0a"]) {
      const post = await call(unsubscribeRoute.action, { path: `/unsubscribe?token=${encodeURIComponent(tok)}`, method: "POST", body: "List-Unsubscribe=One-Click", headers: { "Content-Type": "application/x-www-form-urlencoded" } });
      const get = await call(unsubscribeRoute.loader, { path: `/unsubscribe?token=${encodeURIComponent(tok)}` });
      answers.push(JSON.stringify([post.status, post.data, get.status, get.data]));
    }
    expect(new Set(answers).size).toBe(1);
    expect(JSON.parse(answers[0])).toEqual([400, { error: BAD_TOKEN_MESSAGE, done: false }, 400, { error: BAD_TOKEN_MESSAGE }]);
    expect((await getSubscription(ids.polygon))!.status).toBe("confirmed");
  });
});

describe("subscribe, confirm, manage", () => {
  const t = tag();
  const email = `club-${t}@subscribe.test`;
  const form = (over: Record<string, string> = {}) => ({
    email,
    areaKind: "circle",
    centre: "55°12.30′N 003°01.80′E",
    radiusNm: "1.5",
    polygon: "",
    urgentAlerts: "on",
    digestCadence: "daily",
    digestLocalTime: "07:30",
    digestWeekday: "1",
    ...over,
  });

  it("asks for confirmation by mail, the same answer every time, and confirms by POST", async () => {
    const first = await call(subscribeRoute.action, { path: "/subscribe", form: form() });
    const second = await call(subscribeRoute.action, { path: "/subscribe", form: form() });
    const stranger = await call(subscribeRoute.action, { path: "/subscribe", form: form({ email: `nobody-${t}@subscribe.test` }) });
    for (const r of [first, second, stranger]) {
      expect(r.status).toBe(302);
      expect(r.location).toBe("/subscribe/sent");
    }
    const rows = await db("subscriptions").where({ email }).select("id", "status");
    expect(rows.map((r: any) => r.status)).toEqual(["pending", "pending"]);
    await deliverAll();
    const mail = await waitForMail({ to: email, subject: "Confirm your" });
    const link = new URL(linkIn(mail, "/subscribe/confirm"));
    const page = await call(confirmRoute.loader, { path: link.pathname + link.search });
    expect(page.status).toBe(200);
    expect(page.data).toMatchObject({ email, confirmed: false });
    // Opening the link (GET) does not confirm: mail scanners open links too.
    const id = Number(JSON.parse(Buffer.from(link.searchParams.get("token")!.split(".")[0], "base64url").toString()).s);
    expect((await getSubscription(id))!.status).toBe("pending");
    const done = await call(confirmRoute.action, { path: "/subscribe/confirm", form: { token: link.searchParams.get("token")! } });
    expect(done.data).toEqual({ error: null, confirmed: true });
    const sub = (await getSubscription(id))!;
    expect(sub.status).toBe("confirmed");
    expect(sub.nextDigestAt).not.toBeNull();
  });

  it("lets an unconfirmed request lapse after 72 hours; its link then stops working", async () => {
    const id = await subscribe(harbour, `late-${t}@subscribe.test`, { kind: "harbour" }, { status: "pending" });
    await db("subscriptions").where({ id }).update({ created_at: new Date(Date.now() - 73 * 3600_000) });
    const token = signToken(env().SESSION_SECRET, "confirm", id); // still signed and unexpired
    expect(await lapseUnconfirmed()).toBeGreaterThanOrEqual(1);
    expect(await db("subscriptions").where({ id }).first("status", "ended_reason")).toEqual({ status: "ended", ended_reason: "lapsed" });
    const res = await call(confirmRoute.action, { path: "/subscribe/confirm", form: { token } });
    expect(res.status).toBe(400);
    expect(res.data.error).toBe(BAD_TOKEN_MESSAGE);
  });

  it("refuses bad input with 400 and a message beside each field", async () => {
    const cases: [Record<string, string>, string, RegExp][] = [
      [{ email: `x-${t}@subscribe.test\r\nBcc: victim@elsewhere.test` }, "email", /line breaks/],
      [{ email: `a-${t}@subscribe.test, b-${t}@subscribe.test` }, "email", /one e-mail address/],
      [{ areaKind: "polygon", polygon: "55°13′N 3°00′E\n55°11′N 3°04′E\n55°13′N 3°04′E\n55°11′N 3°00′E" }, "polygon", /cross each other/],
      [{ areaKind: "polygon", polygon: "55°13′N 3°00′E\nsomewhere\n55°11′N 3°04′E" }, "polygon", /Corner 2/],
      [{ centre: "95°00′N 003°00′E" }, "centre", /Centre/],
      [{ digestLocalTime: "01:30" }, "digestLocalTime", /does not exist in Europe\/London on .* clocks go forward from 01:00 to 02:00/],
      [{ digestCadence: "hourly" }, "digestCadence", /how often/],
    ];
    for (const [over, field, message] of cases) {
      const r = await call(subscribeRoute.action, { path: "/subscribe", form: form(over) });
      expect(r.status, JSON.stringify(over)).toBe(400);
      expect(r.data.errors[field], JSON.stringify(r.data.errors)).toMatch(message);
      expect(r.data.values.centre).toBe(form(over).centre); // what was typed comes back
    }
    expect(await db("subscriptions").where("email", "like", `%-${t}@subscribe.test%`).whereNot({ email }).whereNot("email", "like", "nobody-%").whereNot("email", "like", "late-%").count({ n: "*" })).toEqual([{ n: 0 }]);
  });

  it("changes and ends a subscription through the signed manage link", async () => {
    const sub = (await db("subscriptions").where({ email, status: "confirmed" }).first())!;
    const token = signToken(env().SESSION_SECRET, "manage", sub.id);
    const page = await call(manageRoute.loader, { path: `/subscriptions/manage?token=${token}` });
    expect(page.data.values).toMatchObject({ email, areaKind: "circle", radiusNm: "1.5", centre: "55°12.30′N 003°01.80′E" });
    const bad = await call(manageRoute.action, { path: "/subscriptions/manage", form: { ...form({ radiusNm: "-2" }), token } });
    expect(bad.status).toBe(400);
    expect(bad.data.errors.radiusNm).toMatch(/between/);
    const saved = await call(manageRoute.action, { path: "/subscriptions/manage", form: { ...form({ radiusNm: "2.5", digestCadence: "weekly", digestWeekday: "5" }), token } });
    expect(saved.data.saved).toBe(true);
    expect((await getSubscription(sub.id))!).toMatchObject({ area: { kind: "circle", radiusNm: 2.5 }, digest: { cadence: "weekly", weekday: 5 } });
    const forged = await call(manageRoute.action, { path: "/subscriptions/manage", form: { ...form(), token: token.slice(0, -2) + "xx" } });
    expect(forged.status).toBe(400);
    const ended = await call(manageRoute.action, { path: "/subscriptions/manage", form: { token, intent: "end" } });
    expect(ended.data.ended).toBe(true);
    expect((await getSubscription(sub.id))!.status).toBe("ended");
  });

  it("lets a signed-in boater see and end theirs, and only theirs", async () => {
    const { user, cookie } = await signedInAs("boater");
    const mine = await subscribe(harbour, user.email, { kind: "harbour" });
    const other = await subscribe(harbour, `someone-else-${t}@subscribe.test`, { kind: "harbour" });
    const page = await call(accountSubs.loader, { path: "/account/subscriptions", cookie });
    expect(page.data.subscriptions.map((s: any) => s.id)).toEqual([mine]);
    const refused = await call(accountSubs.action, { path: "/account/subscriptions", cookie, form: { id: String(other) } });
    expect(refused.status).toBe(404);
    expect((await getSubscription(other))!.status).toBe("confirmed");
    const ok = await call(accountSubs.action, { path: "/account/subscriptions", cookie, form: { id: String(mine) } });
    expect(ok.status).toBe(302);
    expect((await getSubscription(mine))!.status).toBe("ended");
    expect((await call(accountSubs.loader, { path: "/account/subscriptions" })).status).toBe(302); // signed out → sign-in
  });
});

describe("staff mail desk", () => {
  it("needs mail:admin, shows counts and the outbox, previews a digest and resends failed mail", async () => {
    const boater = await signedInAs("boater");
    expect((await call(staffMail.loader, { path: "/staff/mail", cookie: boater.cookie })).status).toBe(403);
    const hm = await signedInAs("harbourmaster");
    const key = `test-failed:${tag()}`;
    const [failedId] = await db("outbox").insert({ idempotency_key: key, kind: "alert", to_address: "x@staff.test", subject: "S", body_text: "T", headers: "{}", status: "failed", attempts: 10, run_at: new Date(), last_error: "550 mailbox unavailable" });
    const sub = await subscribe(harbour, `preview-${tag()}@staff.test`, { kind: "harbour" }, { digest: { cadence: "daily", localTime: "07:00", weekday: null }, confirmedAt: new Date(Date.now() - 3600_000) });
    const page = await call(staffMail.loader, { path: `/staff/mail?preview=${sub}`, cookie: hm.cookie });
    expect(page.status).toBe(200);
    expect(page.data.counts.length).toBeGreaterThan(0);
    expect(page.data.troubled.map((m: any) => m.id)).toContain(failedId);
    expect(page.data.preview).toMatchObject({ id: sub });
    expect(page.data.preview.text).toMatch(/Changes to notices in your area/);
    const missing = await call(staffMail.loader, { path: `/staff/mail?preview=abc`, cookie: hm.cookie });
    expect(missing.data.previewError).toMatch(/No subscription/);
    const resend = await call(staffMail.action, { path: "/staff/mail", cookie: hm.cookie, form: { intent: "resend", id: String(failedId) } });
    expect(resend.status).toBe(302);
    expect(await db("outbox").where({ id: failedId }).first("status", "attempts")).toEqual({ status: "queued", attempts: 0 });
    expect((await call(staffMail.action, { path: "/staff/mail", cookie: hm.cookie, form: { intent: "resend", id: String(failedId) } })).status).toBe(409);
    await db("outbox").where({ id: failedId }).delete(); // its address does not exist: keep it out of other tests' deliveries
  });
});
