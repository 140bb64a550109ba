// A digest's content for a known set of changes: new, amended, cancelled and expired notices in
// the window, grouped by type, positions in degrees and decimal minutes, links to each notice;
// nothing outside the area, the types or the window; one message per (subscription, period).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db.server";
import { env } from "~/env.server";
import { parsePolygon } from "~/lib/subscriptions/area";
import { digestPeriodKey } from "~/lib/subscriptions/schedule";
import { cancelNotice, expireDueNotices, updateNotice } from "~/models/notice.server";
import { getSubscription, type HarbourForMail } from "~/models/subscription.server";
import { runDigestBatch } from "~/services/digests.server";
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

const H = 3600_000;

describe("digests", () => {
  it("lists what changed in the window that concerns the subscriber, grouped by type", async () => {
    const now = new Date();
    const base = new Date(Math.floor((now.getTime() - 8 * H) / 60_000) * 60_000);
    const at = (hours: number) => new Date(base.getTime() + hours * H);
    const hm = { id: staff.harbourmaster.id, role: "harbourmaster" };
    const box = parsePolygon("55°13′N 3°00′E\n55°13′N 3°04′E\n55°11′N 3°04′E\n55°11′N 3°00′E");
    const t = tag();
    const all = await subscribe(harbour, `all-${t}@digest.test`, box, { digest: { cadence: "daily", localTime: "07:00", weekday: null }, confirmedAt: base });
    const worksOnly = await subscribe(harbour, `works-${t}@digest.test`, box, { types: ["works"], digest: { cadence: "daily", localTime: "07:00", weekday: null }, confirmedAt: base });
    const elsewhere = await subscribe(harbour, `elsewhere-${t}@digest.test`, { kind: "circle", centre: { lat: 55.17, lon: 3.14 }, radiusNm: 0.3 }, { digest: { cadence: "daily", localTime: "07:00", weekday: null }, confirmedAt: base });

    const form = (title: string, generalType: string, position: string, validFrom: Date, validUntil: Date | null = null) => ({
      title,
      generalType,
      detailTypes: [],
      restrictions: [],
      urgency: "routine",
      validFrom: validFrom.toISOString(),
      validUntil: validUntil ? validUntil.toISOString() : "",
      untilFurtherNotice: validUntil ? "" : "on",
      ...pointPart(position),
    });
    // Before the window, unchanged since: not in the digest.
    await publish(harbour.id, staff.harbourmaster, form("Old unchanged", "works", "55°12.00′N 003°02.00′E", at(-4)), at(-4));
    // Published before, cancelled inside the window.
    const light = await publish(harbour.id, staff.harbourmaster, form("Fairway light unlit", "aids_to_navigation_changes", "55°11.50′N 003°01.00′E", at(-2)), at(-2));
    await cancelNotice(light.id, light.version, "Light restored.", hm, { at: at(1) });
    // Published inside the window.
    const wreck = await publish(harbour.id, staff.harbourmaster, form("Dangerous wreck", "newly_discovered_dangers", "55°12.40′N 003°03.10′E", at(2)), at(2));
    // Published before, amended inside.
    const dredge = await publish(harbour.id, staff.harbourmaster, form("Dredging inner basin", "works", "55°12.45′N 003°02.30′E", at(-3)), at(-3));
    await updateNotice(dredge.id, dredge.version, noticeInput(form("Dredging inner basin, extended", "works", "55°12.45′N 003°02.30′E", at(-3))), hm, { at: at(3) });
    // Published and amended inside: still "new".
    const cable = await publish(harbour.id, staff.harbourmaster, form("Cable laying", "works", "55°12.10′N 003°00.50′E", at(1)), at(1));
    await updateNotice(cable.id, cable.version, noticeInput(form("Cable laying, new times", "works", "55°12.10′N 003°00.50′E", at(1))), hm, { at: at(2) });
    // In force, then expired inside.
    const regatta = await publish(harbour.id, staff.harbourmaster, form("Regatta", "special_operations", "55°12.20′N 003°02.90′E", at(-1), at(2)), at(-1));
    expect(await expireDueNotices(at(2.5))).toBeGreaterThanOrEqual(1);
    // Inside the window but outside the polygon.
    await publish(harbour.id, staff.harbourmaster, form("Survey far east", "special_operations", "55°15.00′N 003°09.00′E", at(2)), at(2));

    const slot = new Date(now.getTime() - 60_000);
    await db("subscriptions").whereIn("id", [all, worksOnly, elsewhere]).update({ next_digest_at: slot });
    while ((await runDigestBatch({ now })) > 0);

    const period = digestPeriodKey("daily", harbour.timeZone, slot);
    const row = await db("outbox").where({ idempotency_key: `digest:${all}:${period}` }).first();
    expect(row.subject).toBe(`Daily digest: 5 changes to ${harbour.name} notices`);
    const url = (id: number) => `${env().APP_URL}/notices/${id}`;
    const number = async (id: number) => {
      const n = await db("notices").where({ id }).first();
      return `${n.series_code} ${n.year}/${String(n.number).padStart(3, "0")}`;
    };
    const body: string = row.body_text;
    const section = (title: string) => body.slice(body.indexOf(title)).split("\n\n")[0].split("\n");
    expect(body.indexOf("AIDS TO NAVIGATION CHANGES")).toBeLessThan(body.indexOf("NEWLY DISCOVERED DANGERS"));
    expect(body.indexOf("NEWLY DISCOVERED DANGERS")).toBeLessThan(body.indexOf("WORKS"));
    expect(body.indexOf("WORKS")).toBeLessThan(body.indexOf("SPECIAL OPERATIONS"));
    expect(section("AIDS TO NAVIGATION CHANGES")).toEqual(["AIDS TO NAVIGATION CHANGES", `* [Cancelled] ${await number(light.id)} Fairway light unlit`, "    55°11.50′N 003°01.00′E", `    ${url(light.id)}`]);
    expect(section("NEWLY DISCOVERED DANGERS")).toEqual(["NEWLY DISCOVERED DANGERS", `* [New] ${await number(wreck.id)} Dangerous wreck`, "    55°12.40′N 003°03.10′E", `    ${url(wreck.id)}`]);
    expect(section("WORKS")).toEqual([
      "WORKS",
      `* [New] ${await number(cable.id)} Cable laying, new times`,
      "    55°12.10′N 003°00.50′E",
      `    ${url(cable.id)}`,
      `* [Amended] ${await number(dredge.id)} Dredging inner basin, extended`,
      "    55°12.45′N 003°02.30′E",
      `    ${url(dredge.id)}`,
    ]);
    expect(section("SPECIAL OPERATIONS")).toEqual(["SPECIAL OPERATIONS", `* [Expired] ${await number(regatta.id)} Regatta`, "    55°12.20′N 003°02.90′E", `    ${url(regatta.id)}`]);
    expect(body).not.toContain("Old unchanged");
    expect(body).not.toContain("Survey far east");
    expect(row.body_html).toContain(`href="${url(wreck.id)}"`);
    expect(row.body_html).toContain("55°12.40′N 003°03.10′E");
    expect(JSON.parse(row.headers)).toMatchObject({ "List-Unsubscribe-Post": "List-Unsubscribe=One-Click" });

    const works = await db("outbox").where({ idempotency_key: `digest:${worksOnly}:${period}` }).first();
    expect(works.subject).toBe(`Daily digest: 2 changes to ${harbour.name} notices`);
    expect(works.body_text).not.toContain("Dangerous wreck");
    // Nothing changed in the third area: no mail, but the period is recorded.
    expect(await db("outbox").where({ idempotency_key: `digest:${elsewhere}:${period}` }).first()).toBeUndefined();
    expect(await db("digest_runs").where({ subscription_id: elsewhere, period_key: period }).first("item_count")).toEqual({ item_count: 0 });

    // The schedule moved on to the next local 07:00, and the window starts where this one ended.
    const after = (await getSubscription(all))!;
    expect(after.lastDigestAt!.getTime()).toBe(slot.getTime());
    expect(after.nextDigestAt!.getTime()).toBeGreaterThan(now.getTime());

    // Building the same period again (say, after a crash before the worker saw the commit)
    // queues nothing new.
    await db("subscriptions").where({ id: all }).update({ next_digest_at: slot, last_digest_at: base });
    while ((await runDigestBatch({ now })) > 0);
    expect(await db("outbox").where("idempotency_key", "like", `digest:${all}:%`).count({ n: "*" })).toEqual([{ n: 1 }]);
  });
});
