import { describe, expect, it } from "vitest";
import { direct } from "~/lib/geo/geodesy";
import { AreaError, circlePrefilterRing, parseArea, parsePolygon } from "~/lib/subscriptions/area";
import { groupDigest, positionLines, summariseChanges, type DigestItem } from "~/lib/subscriptions/digest";
import { emailProblem } from "~/lib/subscriptions/email";
import { formToObject, parseSubscriptionForm } from "~/lib/subscriptions/form";
import { areaTouchesPart, distanceToPartM, subscriptionMatchesNotice, type NoticeShape } from "~/lib/subscriptions/matching";
import { checkLocalTimeExists, digestPeriodKey, nextDigestAt, ScheduleError } from "~/lib/subscriptions/schedule";
import { BAD_TOKEN_MESSAGE, signToken, verifyToken } from "~/lib/subscriptions/tokens";

const SECRET = "unit-test-secret-0123456789abcdef0123456789";
const TZ = "Europe/London";

describe("subscriber e-mail addresses", () => {
  it("accepts one plain address", () => {
    expect(emailProblem("skipper@kestrel-sound.example")).toBeNull();
  });
  it.each([
    ["a@b.example\r\nBcc: victim@evil.example", /line breaks/],
    ["a@b.example\nX: y", /line breaks/],
    ["a@b.example, c@d.example", /one e-mail address/],
    ["a@b.example;c@d.example", /one e-mail address/],
    ["a@b@c.example", /one e-mail address/],
    ["Skipper <a@b.example>", /plain e-mail address/],
    ["not an address", /plain e-mail address/],
    ["", /Enter your e-mail/],
    ["x".repeat(250) + "@b.example", /at most 254/],
  ])("refuses %j", (value, message) => {
    expect(emailProblem(value)).toMatch(message);
  });
});

describe("signed tokens", () => {
  const now = Date.UTC(2026, 11, 1, 12);
  it("round-trips and names the subscription", () => {
    const t = signToken(SECRET, "unsubscribe", 42, now);
    expect(verifyToken(SECRET, "unsubscribe", t, now)).toMatchObject({ ok: true, subscriptionId: 42 });
  });
  it("refuses a token for another purpose, a changed payload, another secret, and an expired one", () => {
    const t = signToken(SECRET, "confirm", 42, now);
    expect(verifyToken(SECRET, "unsubscribe", t, now)).toEqual({ ok: false, reason: "bad_signature" });
    const [, sig] = t.split(".");
    const forged = `${Buffer.from(JSON.stringify({ s: 43, e: 9999999999 })).toString("base64url")}.${sig}`;
    expect(verifyToken(SECRET, "confirm", forged, now)).toEqual({ ok: false, reason: "bad_signature" });
    expect(verifyToken("another-secret-0123456789abcdef012345", "confirm", t, now)).toEqual({ ok: false, reason: "bad_signature" });
    expect(verifyToken(SECRET, "confirm", t, now + 72 * 3600_000 + 1000)).toEqual({ ok: false, reason: "expired" });
    expect(verifyToken(SECRET, "confirm", "garbage", now)).toEqual({ ok: false, reason: "malformed" });
    expect(verifyToken(SECRET, "confirm", null, now)).toEqual({ ok: false, reason: "malformed" });
    expect(BAD_TOKEN_MESSAGE).not.toMatch(/subscri(bed|ption) (exists|found)/);
  });
});

describe("digest scheduling in the harbour's time zone", () => {
  it("refuses a time inside the spring-forward gap with the date and the gap named", () => {
    // UK clocks go forward at 01:00 GMT on the last Sunday of March (Summer Time Act 1972 as
    // amended; EU Directive 2000/84/EC): 28 March 2027, so 01:30 does not exist that day.
    const from = new Date(Date.UTC(2026, 11, 1));
    expect(() => checkLocalTimeExists(TZ, "01:30", from)).toThrow(ScheduleError);
    expect(() => checkLocalTimeExists(TZ, "01:30", from)).toThrow(/01:30 does not exist in Europe\/London on Sunday 28 March 2027: clocks go forward from 01:00 to 02:00/);
    expect(() => checkLocalTimeExists(TZ, "02:00", from)).not.toThrow();
    expect(() => checkLocalTimeExists(TZ, "00:59", from)).not.toThrow();
    expect(() => checkLocalTimeExists(TZ, "7:5", from)).toThrow(/HH:MM/);
  });

  it("puts the next daily slot at the local time, across the change of offset", () => {
    const s = { cadence: "daily" as const, localTime: "07:00", weekday: null };
    // 27 March 2027 08:00 GMT → next is 28 March 07:00 BST = 06:00 UTC.
    expect(nextDigestAt(s, TZ, new Date("2027-03-27T08:00:00Z"))!.toISOString()).toBe("2027-03-28T06:00:00.000Z");
    expect(nextDigestAt(s, TZ, new Date("2026-12-01T06:59:00Z"))!.toISOString()).toBe("2026-12-01T07:00:00.000Z");
    expect(nextDigestAt(s, TZ, new Date("2026-12-01T07:00:00Z"))!.toISOString()).toBe("2026-12-02T07:00:00.000Z");
  });

  it("puts the next weekly slot on the chosen ISO weekday", () => {
    const s = { cadence: "weekly" as const, localTime: "18:30", weekday: 5 }; // Friday
    // 1 December 2026 is a Tuesday; the Friday is 4 December.
    expect(nextDigestAt(s, TZ, new Date("2026-12-01T12:00:00Z"))!.toISOString()).toBe("2026-12-04T18:30:00.000Z");
  });

  it("keys periods by local date or ISO week", () => {
    // 23:30 UTC on 30 June is 00:30 BST on 1 July in London.
    expect(digestPeriodKey("daily", TZ, new Date("2026-06-30T23:30:00Z"))).toBe("D2026-07-01");
    expect(digestPeriodKey("weekly", TZ, new Date("2026-12-04T18:30:00Z"))).toBe("W2026-W49");
  });
});

describe("areas", () => {
  it("parses a circle from a position as mariners write it", () => {
    const a = parseArea({ areaKind: "circle", centre: "55°12.00′N 003°02.00′E", radiusNm: "1,5" });
    expect(a).toEqual({ kind: "circle", centre: { lat: 55.2, lon: 3 + 2 / 60 }, radiusNm: 1.5 });
  });
  it("refuses a bad centre, a bad radius, and no choice", () => {
    expect(() => parseArea({ areaKind: "circle", centre: "95N 3E", radiusNm: "1" })).toThrow(AreaError);
    expect(() => parseArea({ areaKind: "circle", centre: "55N 3E", radiusNm: "0" })).toThrow(/between/);
    expect(() => parseArea({ areaKind: "circle", centre: "55N 3E", radiusNm: "abc" })).toThrow(/radius/);
    expect(() => parseArea({})).toThrow(/Choose the area/);
  });
  it("closes a polygon and refuses one whose edges cross", () => {
    const p = parsePolygon("55°13′N 3°00′E\n55°13′N 3°04′E\n55°11′N 3°04′E\n55°11′N 3°00′E");
    expect(p.kind === "polygon" && p.ring.length).toBe(5);
    // A bow tie: the second and fourth corners swapped.
    expect(() => parsePolygon("55°13′N 3°00′E\n55°11′N 3°04′E\n55°13′N 3°04′E\n55°11′N 3°00′E")).toThrow(/cross each other near 55°12\.00′N 003°02\.00′E/);
    expect(() => parsePolygon("55N 3E\n55.1N 3E")).toThrow(/at least three/);
    expect(() => parsePolygon("55N 3E\n55.1N 3E\n55.2N 3E")).toThrow(/one line/);
    expect(() => parsePolygon("55N 3E\nnowhere\n55.2N 3.1E")).toThrow(/Corner 2/);
  });
  it("builds a prefilter polygon that contains the circle", () => {
    const ring = circlePrefilterRing({ lat: 55.2, lon: 3.05 }, 1);
    expect(ring).toHaveLength(33);
    const centre = { lat: 55.2, lon: 3.05 };
    for (const [lon, lat] of ring.slice(0, -1)) expect(distanceToPartM(centre, { kind: "point", coordinates: [[lon, lat]], radiusNm: null })).toBeGreaterThan(1852);
  });
});

describe("exact matching", () => {
  const centre = { lat: 55.2, lon: 3.05 };
  const at = (bearing: number, metres: number): [number, number] => {
    const p = direct(centre.lat, centre.lon, bearing, metres);
    return [p.lon, p.lat];
  };
  const circle = (radiusNm: number) => ({ kind: "circle" as const, centre, radiusNm });

  it("tests circles geodesically: a point 1 M away is inside a 1.001 M circle and outside a 0.999 M one", () => {
    const part = { kind: "point" as const, coordinates: [at(63, 1852)], radiusNm: null };
    expect(areaTouchesPart(circle(1.001), part)).toBe(true);
    expect(areaTouchesPart(circle(0.999), part)).toBe(false);
  });
  it("measures to the nearest point of a line, not only its ends", () => {
    // A line running north–south 1 M east of the centre, its ends 3 M away.
    const line = { kind: "line" as const, coordinates: [at(90, 1852), at(90, 1852)].map((p, i) => [p[0], p[1] + (i ? 0.05 : -0.05)] as [number, number]), radiusNm: null };
    expect(distanceToPartM(centre, line)).toBeGreaterThan(1840);
    expect(distanceToPartM(centre, line)).toBeLessThan(1860);
    expect(areaTouchesPart(circle(1.02), line)).toBe(true);
    expect(areaTouchesPart(circle(0.98), line)).toBe(false);
  });
  it("counts a centre inside a notice area as touching, and a notice circle by its radius", () => {
    const area = { kind: "area" as const, coordinates: [[3.0, 55.1], [3.1, 55.1], [3.1, 55.3], [3.0, 55.3]] as [number, number][], radiusNm: null };
    expect(distanceToPartM(centre, area)).toBe(0);
    const noticeCircle = { kind: "circle" as const, coordinates: [at(0, 2 * 1852)], radiusNm: 0.5 };
    expect(areaTouchesPart(circle(1.51), noticeCircle)).toBe(true);
    expect(areaTouchesPart(circle(1.49), noticeCircle)).toBe(false);
  });
  it("intersects polygons with points, lines, areas and circles", () => {
    const poly = parsePolygon("55°13′N 3°00′E\n55°13′N 3°04′E\n55°11′N 3°04′E\n55°11′N 3°00′E");
    const inside = { kind: "point" as const, coordinates: [[3.03, 55.2]] as [number, number][], radiusNm: null };
    const outside = { kind: "point" as const, coordinates: [[3.1, 55.2]] as [number, number][], radiusNm: null };
    const crossing = { kind: "line" as const, coordinates: [[2.9, 55.2], [3.1, 55.2]] as [number, number][], radiusNm: null };
    expect(areaTouchesPart(poly, inside)).toBe(true);
    expect(areaTouchesPart(poly, outside)).toBe(false);
    expect(areaTouchesPart(poly, crossing)).toBe(true);
    // A circle 1 M east of the polygon's east edge (3°04′E): touches with 1.1 M radius, not 0.9 M.
    const eastEdgeLon = 3 + 4 / 60;
    const c = direct(55.2, eastEdgeLon, 90, 1852);
    expect(areaTouchesPart(poly, { kind: "circle", coordinates: [[c.lon, c.lat]], radiusNm: 1.1 })).toBe(true);
    expect(areaTouchesPart(poly, { kind: "circle", coordinates: [[c.lon, c.lat]], radiusNm: 0.9 })).toBe(false);
  });
  it("filters by notice type and harbour; the whole harbour matches any notice there", () => {
    const notice: NoticeShape = { id: 1, harbourId: 1, generalType: "works", parts: [{ kind: "point", coordinates: [[3.5, 55.5]], radiusNm: null }] };
    expect(subscriptionMatchesNotice({ harbourId: 1, area: { kind: "harbour" }, generalTypes: [] }, notice)).toBe(true);
    expect(subscriptionMatchesNotice({ harbourId: 2, area: { kind: "harbour" }, generalTypes: [] }, notice)).toBe(false);
    expect(subscriptionMatchesNotice({ harbourId: 1, area: { kind: "harbour" }, generalTypes: ["newly_discovered_dangers"] }, notice)).toBe(false);
    expect(subscriptionMatchesNotice({ harbourId: 1, area: circle(1), generalTypes: ["works"] }, notice)).toBe(false);
  });
});

describe("digest content", () => {
  it("words a window's changes by the latest that matters", () => {
    expect(summariseChanges(["published", "amended"])).toBe("new");
    expect(summariseChanges(["amended"])).toBe("amended");
    expect(summariseChanges(["published", "cancelled"])).toBe("cancelled");
    expect(summariseChanges(["amended", "expired"])).toBe("expired");
  });
  it("groups by general type in S-124 order and writes positions in degrees and decimal minutes", () => {
    const n = (id: number, generalType: string, urgency: "urgent" | "routine" = "routine") => ({
      id, seriesNumber: `KSH 2026/${String(id).padStart(3, "0")}`, title: `Notice ${id}`, generalType, urgency, validUntil: null,
      parts: [{ kind: "point" as const, coordinates: [[3.0425, 55.1875]] as [number, number][], radiusNm: null }],
    });
    const items: DigestItem[] = [
      { notice: n(3, "works"), change: "new", at: new Date(), positions: positionLines(n(3, "works").parts) },
      { notice: n(1, "aids_to_navigation_changes"), change: "cancelled", at: new Date(), positions: [] },
      { notice: n(2, "aids_to_navigation_changes", "urgent"), change: "new", at: new Date(), positions: [] },
    ];
    const groups = groupDigest(items);
    expect(groups.map((g) => g.label)).toEqual(["Aids to navigation changes", "Works"]);
    expect(groups[0].items.map((i) => i.notice.id)).toEqual([2, 1]);
    expect(groups[1].items[0].positions).toEqual(["55°11.25′N 003°02.55′E"]);
  });
});

describe("the subscribe form", () => {
  const form = (entries: [string, string][]) => {
    const f = new FormData();
    for (const [k, v] of entries) f.append(k, v);
    return formToObject(f);
  };
  it("parses a complete request", () => {
    const r = parseSubscriptionForm(
      form([["email", " Club@Example.org "], ["areaKind", "harbour"], ["generalTypes", "works"], ["generalTypes", "works"], ["urgentAlerts", "on"], ["digestCadence", "weekly"], ["digestLocalTime", "18:00"], ["digestWeekday", "6"]]),
      TZ,
      { withEmail: true, now: new Date("2026-12-01T00:00:00Z") },
    );
    expect(r).toEqual({ ok: true, data: { email: "club@example.org", area: { kind: "harbour" }, generalTypes: ["works"], urgentAlerts: true, digest: { cadence: "weekly", localTime: "18:00", weekday: 6 } } });
  });
  it("names every bad field at once", () => {
    const r = parseSubscriptionForm(form([["email", "a@b.example\r\nBcc: x@y.example"], ["areaKind", "polygon"], ["polygon", "55N 3E"], ["digestCadence", "daily"], ["digestLocalTime", "01:15"], ["generalTypes", "piracy_on_the_moon"]]), TZ, { withEmail: true, now: new Date("2026-12-01T00:00:00Z") });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors.generalTypes).toMatch(/Unknown notice type/);
  });
  it("names area, time and e-mail problems together", () => {
    const r = parseSubscriptionForm(form([["email", "a@b.example, c@d.example"], ["areaKind", "polygon"], ["polygon", "55N 3E"], ["digestCadence", "daily"], ["digestLocalTime", "01:15"]]), TZ, { withEmail: true, now: new Date("2026-12-01T00:00:00Z") });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors.email).toMatch(/one e-mail address/);
    expect(r.errors.polygon).toMatch(/at least three/);
    expect(r.errors.digestLocalTime).toMatch(/does not exist/);
  });
  it("wants alerts or a digest", () => {
    const r = parseSubscriptionForm(form([["email", "a@b.example"], ["areaKind", "harbour"], ["digestCadence", "none"]]), TZ, { withEmail: true });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.digestCadence).toMatch(/urgent alerts, a digest, or both/);
  });
});
