// The public API, Atom feed, GPX and the staff editor's actions, called as route handlers with
// real Requests against the real test database.
import { XMLParser } from "fast-xml-parser";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db.server";
import { ringSignedArea2, type LonLat } from "~/lib/notices/geometry";
import { clearHarbourCache } from "~/models/harbour.server";
import { conditionalGet } from "~/services/http-cache.server";
import { cancelNotice, createDraft, getNotice, publishNotice, updateNotice } from "~/models/notice.server";
import * as apiList from "~/routes/api.v1.notices";
import * as apiOne from "~/routes/api.v1.notices.id";
import * as atom from "~/routes/feeds.notices.atom";
import * as gpx from "~/routes/notices.gpx";
import * as editRoute from "~/routes/staff.notices.edit";
import * as newRoute from "~/routes/staff.notices.new";
import { call, signedInAs } from "../support/routes";
import { makeHarbour, makeStaff, noticeForm, noticeInput } from "./notices-fixtures";

let harbour: { id: number; seriesCode: string };
let staff: Awaited<ReturnType<typeof makeStaff>>;
// A box of open sea only this file uses (invented waters, DEMO.md): 55.30–55.40 N, 3.50–3.70 E.
const BOX = "3.5,55.3,3.7,55.4";
const area = (acceptOutside = "on") => ({
  "parts.0.kind": "area",
  "parts.0.crs": "EPSG:4326",
  // Typed clockwise (NW, NE, SE, SW); GeoJSON must come out counter-clockwise.
  "parts.0.positions": "55°21.0′N 003°33.0′E\n55°21.0′N 003°36.0′E\n55°19.0′N 003°36.0′E\n55°19.0′N 003°33.0′E",
  acceptOutside,
});

beforeAll(async () => {
  harbour = await makeHarbour();
  staff = await makeStaff();
  clearHarbourCache();
});
afterAll(async () => {
  await db.destroy();
});

async function published(overrides: Record<string, string | string[]> = {}) {
  const d = await createDraft(harbour.id, noticeInput({ ...area(), ...overrides }), staff.officer);
  return publishNotice(d.id, d.version, staff.harbourmaster);
}

describe("GET /api/v1/notices (RFC 7946)", () => {
  it("returns a FeatureCollection in lon/lat order with counter-clockwise exterior rings", async () => {
    const n = await published({ title: "API geometry check" });
    const res = await call(apiList.loader, { path: `/api/v1/notices?bbox=${BOX}` });
    expect(res.status).toBe(200);
    expect(res.headers.get("Content-Type")).toContain("application/geo+json");
    expect(res.data.type).toBe("FeatureCollection");
    const f = res.data.features.find((x: { id: number }) => x.id === n.id);
    expect(f.type).toBe("Feature");
    expect(f.geometry.type).toBe("Polygon");
    const ring = f.geometry.coordinates[0] as LonLat[];
    // RFC 7946 §3.1.1: [longitude, latitude]; §3.1.6: first = last, exterior counter-clockwise.
    for (const [x, y] of ring) {
      expect(x).toBeGreaterThan(3.5);
      expect(x).toBeLessThan(3.7);
      expect(y).toBeGreaterThan(55.3);
      expect(y).toBeLessThan(55.4);
    }
    expect(ring[0]).toEqual(ring.at(-1));
    expect(ringSignedArea2(ring.slice(0, -1))).toBeGreaterThan(0);
    expect(f.properties.seriesNumber).toBe(n.seriesNumber);
    expect(f.properties.status).toBe("in_force");
  });

  it("filters by bbox on the spatial index and by status", async () => {
    const n = await published({ title: "Far away" });
    const miss = await call(apiList.loader, { path: "/api/v1/notices?bbox=-10,40,-9,41" });
    expect(miss.data.features.map((f: { id: number }) => f.id)).not.toContain(n.id);
    await cancelNotice(n.id, n.version, "Test over", staff.harbourmaster);
    const inForce = await call(apiList.loader, { path: `/api/v1/notices?bbox=${BOX}` });
    expect(inForce.data.features.map((f: { id: number }) => f.id)).not.toContain(n.id);
    const cancelled = await call(apiList.loader, { path: `/api/v1/notices?bbox=${BOX}&status=cancelled` });
    const f = cancelled.data.features.find((x: { id: number }) => x.id === n.id);
    expect(f.properties.status).toBe("cancelled");
    expect(f.properties.cancellationReason).toBe("Test over");
  });

  it("paginates with a cursor, without repeats", async () => {
    for (let i = 0; i < 3; i++) await published({ title: `Page ${i}` });
    const seen: number[] = [];
    let path: string | null = `/api/v1/notices?bbox=${BOX}&limit=2`;
    while (path) {
      const res = await call(apiList.loader, { path });
      expect(res.status).toBe(200);
      expect(res.data.features.length).toBeLessThanOrEqual(2);
      seen.push(...res.data.features.map((f: { id: number }) => f.id));
      const next = res.data.links.find((l: { rel: string }) => l.rel === "next");
      path = next ? new URL(next.href).pathname + new URL(next.href).search : null;
    }
    expect(new Set(seen).size).toBe(seen.length);
    expect(seen.length).toBeGreaterThanOrEqual(4);
    expect([...seen].sort((a, b) => a - b)).toEqual(seen);
  });

  it("answers 304 to a matching If-None-Match and carries Last-Modified", async () => {
    const first = await call(apiList.loader, { path: `/api/v1/notices?bbox=${BOX}` });
    const etag = first.headers.get("ETag")!;
    expect(etag).toMatch(/^W\/"/);
    expect(first.headers.get("Last-Modified")).toMatch(/GMT$/);
    expect(first.headers.get("Cache-Control")).toMatch(/max-age/);
    const again = await call(apiList.loader, { path: `/api/v1/notices?bbox=${BOX}`, headers: { "If-None-Match": etag } });
    expect(again.status).toBe(304);
    await published({ title: "A change" });
    const changed = await call(apiList.loader, { path: `/api/v1/notices?bbox=${BOX}`, headers: { "If-None-Match": etag } });
    expect(changed.status).toBe(200);
  });

  it("refuses bad parameters with 400 naming the field", async () => {
    for (const [q, field] of [
      ["bbox=1,2,3", "bbox"],
      ["bbox=3,55,2,56", "bbox"],
      ["bbox=a,b,c,d", "bbox"],
      ["limit=0", "limit"],
      ["limit=9999", "limit"],
      ["cursor=%%%", "cursor"],
      ["status=nonsense", "status"],
      ["type=weather", "type"],
      ["since=yesterday", "since"],
    ] as const) {
      const res = await call(apiList.loader, { path: `/api/v1/notices?${q}` });
      expect(res.status, q).toBe(400);
      expect(res.data.field, q).toBe(field);
      expect(typeof res.data.error).toBe("string");
    }
  });
});

describe("GET /api/v1/notices/:id and GPX", () => {
  it("gives every attribute of a published notice, and 404 for drafts", async () => {
    const n = await published({ title: "Full feature", "parts.0.crs": "EPSG:4230" });
    const res = await call(apiOne.loader, { path: `/api/v1/notices/${n.id}`, params: { id: String(n.id) } });
    expect(res.status).toBe(200);
    expect(res.data.properties.parts[0].crs).toBe("EPSG:4230");
    expect(res.data.properties.parts[0].positionsAsEntered[0]).toBe("55°21.0′N 003°33.0′E");
    expect(res.data.properties.restrictions).toEqual([
      { code: 1, label: "Anchoring prohibited" },
      { code: 27, label: "Speed restricted" },
    ]);
    expect(res.data.properties.broadcastText).toContain(n.seriesNumber);
    const d = await createDraft(harbour.id, noticeInput(area()), staff.officer);
    expect((await call(apiOne.loader, { path: `/api/v1/notices/${d.id}`, params: { id: String(d.id) } })).status).toBe(404);
    expect((await call(apiOne.loader, { path: "/api/v1/notices/x", params: { id: "x" } })).status).toBe(400);
    const g = await call(gpx.loader, { path: `/notices/${n.id}/gpx`, params: { id: String(n.id) } });
    expect(g.status).toBe(200);
    expect(g.headers.get("Content-Type")).toContain("application/gpx+xml");
    expect(String(g.data)).toContain("<rte>");
  });
});

describe("Atom feed (RFC 4287)", () => {
  it("parses as XML and carries publications, amendments and cancellations", async () => {
    const n = await published({ title: "Feed subject" });
    const amended = await updateNotice(n.id, n.version, noticeInput({ ...area(), title: "Feed subject (amended)" }), staff.harbourmaster);
    await cancelNotice(n.id, amended.version, "Feed test complete", staff.harbourmaster);
    const res = await call(atom.loader, { path: "/feeds/notices.atom" });
    expect(res.status).toBe(200);
    expect(res.headers.get("Content-Type")).toContain("application/atom+xml");
    const xml = String(res.data);
    const doc = new XMLParser({ ignoreAttributes: false }).parse(xml);
    const feed = doc.feed;
    expect(feed["@_xmlns"]).toBe("http://www.w3.org/2005/Atom");
    // RFC 4287 §4.1.1: atom:feed has id, title, updated.
    expect(feed.id).toBeTruthy();
    expect(feed.title).toBeTruthy();
    expect(Number.isNaN(Date.parse(feed.updated))).toBe(false);
    const entries = (Array.isArray(feed.entry) ? feed.entry : [feed.entry]) as Record<string, unknown>[];
    const titles = entries.map((e) => String((e.title as { "#text"?: string })?.["#text"] ?? e.title));
    expect(titles.some((t) => t.startsWith("Published:") && t.includes("Feed subject"))).toBe(true);
    expect(titles.some((t) => t.startsWith("Amended:") && t.includes("Feed subject (amended)"))).toBe(true);
    expect(titles.some((t) => t.startsWith("Cancelled:") && t.includes(n.seriesNumber!))).toBe(true);
    for (const e of entries) {
      // §4.1.2: each entry has id, title, updated; ids are unique.
      expect(e.id).toBeTruthy();
      expect(Number.isNaN(Date.parse(String(e.updated)))).toBe(false);
    }
    expect(new Set(entries.map((e) => e.id)).size).toBe(entries.length);
    expect(xml).toContain("Feed test complete");
  });
});

describe("staff editor actions: bad input is a field error, nothing lost, never a 500", () => {
  it("refuses crossing polygons, short shapes, radius 0, unparseable lines and an end before the start", async () => {
    const { cookie } = await signedInAs("officer");
    const cases: [Record<string, string>, string, RegExp][] = [
      [{ "parts.0.kind": "area", "parts.0.positions": "55 20N 3 33E\n55 21N 3 36E\n55 20N 3 36E\n55 21N 3 33E" }, "parts.0.positions", /cross/],
      [{ "parts.0.kind": "area", "parts.0.positions": "55 20N 3 33E\n55 21N 3 36E" }, "parts.0.positions", /three/],
      [{ "parts.0.kind": "line", "parts.0.positions": "55 20N 3 33E" }, "parts.0.positions", /two positions/],
      [{ "parts.0.kind": "circle", "parts.0.positions": "55 20N 3 33E", "parts.0.radiusNm": "0" }, "parts.0.radiusNm", /greater than 0/],
      [{ "parts.0.kind": "area", "parts.0.positions": "55 20N 3 33E\n55 21N 3 36E\nfifty-five north\n55 20N 3 36E" }, "parts.0.positions", /^Line 3: /],
      [{ validFrom: "2026-12-10T10:00", validUntil: "2026-12-09T10:00" }, "validUntil", /after the start/],
    ];
    for (const [change, field, message] of cases) {
      const form: Record<string, string> = { ...(noticeForm(area()) as Record<string, string>), detailTypes: "89", restrictions: "1", ...change, intent: "save" };
      const before = await db("notices").count({ c: "*" }).first();
      const res = await call(newRoute.action, { path: "/staff/notices/new", form, cookie, headers: { Origin: "http://127.0.0.1:3000" } });
      expect(res.status, field).toBe(400);
      expect(res.data.errors[field], JSON.stringify(res.data.errors)).toMatch(message);
      expect(res.data.values.title).toBe(form.title); // kept
      expect(res.data.values["parts.0.positions"]).toBe(form["parts.0.positions"]);
      expect((await db("notices").count({ c: "*" }).first())!.c).toBe(before!.c); // nothing saved
    }
  });

  it("warns about geometry outside the harbour; ticking the box accepts it", async () => {
    const { cookie } = await signedInAs("officer");
    const form = { ...(noticeForm(area("")) as Record<string, string>), detailTypes: "89", restrictions: "1", intent: "save" };
    const warned = await call(newRoute.action, { path: "/staff/notices/new", form, cookie });
    // The default harbour is whichever the test database holds first; our box is outside any test harbour.
    expect(warned.status).toBe(400);
    expect(warned.data.errors.acceptOutside).toMatch(/outside the harbour/);
    const ok = await call(newRoute.action, { path: "/staff/notices/new", form: { ...form, acceptOutside: "on" }, cookie });
    expect(ok.status).toBe(302);
  });

  it("a stale version gives a 409 version error with the typed values kept", async () => {
    const { cookie } = await signedInAs("harbourmaster");
    const d = await createDraft(harbour.id, noticeInput(area()), staff.officer);
    await updateNotice(d.id, d.version, noticeInput({ ...area(), title: "Changed by a colleague" }), staff.officer);
    const form = { ...(noticeForm(area()) as Record<string, string>), detailTypes: "89", restrictions: "1", title: "My edit", version: String(d.version), intent: "publish" };
    const res = await call(editRoute.action, { path: `/staff/notices/${d.id}/edit`, form, cookie, params: { id: String(d.id) } });
    expect(res.status).toBe(409);
    expect(res.data.errors.version).toMatch(/Someone else changed this notice/);
    expect(res.data.values.title).toBe("My edit");
    const now = (await getNotice(d.id))!;
    expect(now.title).toBe("Changed by a colleague");
    expect(now.status).toBe("draft");
  });

  it("an officer cannot publish or cancel through the edit action", async () => {
    const { cookie } = await signedInAs("officer");
    const n = await published({ title: "Officer may not cancel" });
    const res = await call(editRoute.action, { path: `/staff/notices/${n.id}/edit`, form: { intent: "cancel", version: String(n.version), reason: "because" }, cookie, params: { id: String(n.id) } });
    expect(res.status).toBe(403);
    expect((await getNotice(n.id))!.status).toBe("in_force");
    const boater = await signedInAs("boater");
    const denied = await call(newRoute.loader, { path: "/staff/notices/new", cookie: boater.cookie });
    expect(denied.status).toBe(403);
  });
});

describe("page validators (conditionalGet middleware)", () => {
  const page = (etag: string, extra: Record<string, string> = {}) => async () =>
    new Response("<html>…</html>", {
      status: 200,
      headers: { ETag: etag, "Cache-Control": "public, no-cache", "Content-Security-Policy": "script-src 'self' 'nonce-NEW123'", ...extra },
    });
  const run = (headers: Record<string, string>, next: () => Promise<Response>) =>
    (conditionalGet as unknown as (a: { request: Request }, n: () => Promise<Response>) => Promise<Response>)({ request: new Request("http://127.0.0.1:3000/notices/1", { headers }) }, next);

  it("adds the response's CSP nonce to the ETag and answers 304 with the client's nonce", async () => {
    const first = await run({}, page('W/"abc"'));
    expect(first.status).toBe(200);
    expect(first.headers.get("ETag")).toBe('W/"abc.NEW123"');
    const again = await run({ "If-None-Match": 'W/"abc.OLD999"' }, page('W/"abc"'));
    expect(again.status).toBe(304);
    // The browser keeps its cached copy (nonce OLD999): the 304's CSP must allow that nonce.
    expect(again.headers.get("Content-Security-Policy")).toContain("'nonce-OLD999'");
    expect(again.headers.get("ETag")).toBe('W/"abc.OLD999"');
    const changed = await run({ "If-None-Match": 'W/"abc.OLD999"' }, page('W/"def"'));
    expect(changed.status).toBe(200);
  });

  it("never revalidates a response that sets a cookie (a one-time toast)", async () => {
    const res = await run({ "If-None-Match": 'W/"abc"' }, page('W/"abc"', { "Set-Cookie": "tw_session=x" }));
    expect(res.status).toBe(200);
    expect(res.headers.get("ETag")).toBeNull();
  });
});
