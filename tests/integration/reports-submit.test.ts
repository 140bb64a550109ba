// Discrepancy reports end to end on the server: the form action and POST /api/v1/reports give
// the same assessment as the position engine; photos are checked by content; the public copy
// has no GPS; object storage stopped mid-submit leaves nothing saved and nothing orphaned.
import exifr from "exifr";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { db } from "~/db.server";
import { assess } from "~/lib/geo/assessment";
import { assessmentInputFor } from "~/lib/reports/schema";
import { getAid } from "~/models/aid.server";
import { cleanupExpiredUploads } from "~/models/photo.server";
import { reportLinkKey } from "~/models/report.server";
import { getObject, listKeys } from "~/services/storage.server";
import * as reportApi from "~/routes/api.v1.reports";
import * as uploadsApi from "~/routes/api.v1.uploads";
import * as completeApi from "~/routes/api.v1.uploads.complete";
import * as photosRoute from "~/routes/photos";
import * as reportRoute from "~/routes/report";
import * as detailRoute from "~/routes/reports.detail";
import * as img from "../support/images";
import { call, signedInAs } from "../support/routes";
import { CHARTED, ensureHarbour, makeAid, pastIso, privateS3, radarObservationOf } from "./reports-fixtures";

let s3: Awaited<ReturnType<typeof privateS3>>;
let aid: { id: number; code: string };

beforeAll(async () => {
  s3 = await privateS3();
  const h = await ensureHarbour();
  aid = await makeAid(h.id);
});
afterAll(async () => {
  await s3.close();
});

const json = (body: unknown, cookie?: string) => ({
  path: "/api/v1/reports",
  method: "POST",
  body: JSON.stringify(body),
  headers: { "Content-Type": "application/json" },
  cookie,
});

async function uploadFile(buf: Buffer, name = "photo.jpg", type = "image/jpeg", cookie?: string) {
  const fd = new FormData();
  fd.append("photo", new File([new Uint8Array(buf)], name, { type }));
  return call(uploadsApi.action, { path: "/api/v1/uploads", method: "POST", body: fd, cookie });
}

function radarForm(o: ReturnType<typeof radarObservationOf>, extra: Record<string, string> = {}) {
  const fd = new FormData();
  const fields: Record<string, string> = {
    target: "aid",
    aidId: String(aid.id),
    method: "radar",
    "radar.ownPosition": o.ownPosition,
    "radar.rangeNm": String(o.rangeNm),
    "radar.bearingDeg": String(o.bearingDeg),
    "radar.bearingRef": "true",
    "radar.rangeScaleNm": String(o.rangeScaleNm),
    // datetime-local in the harbour's zone (Europe/London): 30 minutes ago, to the minute.
    observedAt: new Intl.DateTimeFormat("sv-SE", { timeZone: "Europe/London", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit" })
      .format(new Date(Date.now() - 30 * 60_000))
      .replace(" ", "T"),
    remarks: "Seen on radar after the gale, light working.",
    reporterEmail: "skipper@boats.example",
    reporterName: "Test Skipper",
    ...extra,
  };
  for (const [k, v] of Object.entries(fields)) fd.append(k, v);
  return fd;
}

describe("assessment figures through the API and the form", () => {
  it("POST /api/v1/reports: radar 0.08 M east of charted → off station, the same figures as assess()", async () => {
    // 0.08 M = 148.16 m (1 M = 1852 m exactly, International Hydrographic Conference 1929).
    const o = radarObservationOf(148.16, 90);
    const observation = { method: "radar", ownPosition: o.ownPosition, rangeNm: o.rangeNm, bearingDeg: o.bearingDeg, bearingRef: "true", rangeScaleNm: o.rangeScaleNm };
    const observedAt = pastIso(20);
    const res = await call(reportApi.action, json({ aid: aid.code, observation, observedAt, reporter: { email: "api-client@boats.example" } }));
    expect(res.status, JSON.stringify(res.data)).toBe(201);
    const a = res.data.assessment;
    expect(a.verdict).toBe("off_station");
    expect(a.displacement.distanceM).toBeCloseTo(148.16, 1);
    expect(a.displacement.bearingTrueDeg).toBeCloseTo(90, 0);
    // √(30² − 10²) = 28.28 m (taut-chain geometry, ../shared/TRADE.md)
    expect(a.swingRadiusM).toBeCloseTo(28.284, 2);
    const engine = assess(assessmentInputFor((await getAid(aid.id))!, [{ ...observation, observedAt }]));
    expect(a.combinedUncertaintyM).toBeCloseTo(engine.combinedUncertaintyM, 6);
    expect(a.estimate.lat).toBeCloseTo(engine.estimate.lat, 9);
    const row = await db("reports").where({ id: res.data.id }).first();
    expect(row.verdict).toBe("off_station");
    expect(Number(row.displacement_m)).toBeCloseTo(148.16, 1);
    expect(res.data.followUrl).toContain(`/reports/${res.data.id}?key=`);
  });

  it("the form action stores the same figures and redirects the guest to the signed follow link", async () => {
    const o = radarObservationOf(148.16, 90);
    const before = await db("reports").count({ n: "*" }).first();
    const res = await call(reportRoute.action, { path: "/report", method: "POST", body: radarForm(o) });
    expect(res.status, JSON.stringify(res.data)).toBe(302);
    const m = /^\/reports\/(\d+)\?key=([\w-]+)$/.exec(res.location ?? "");
    expect(m, res.location ?? "").not.toBeNull();
    const row = await db("reports").where({ id: Number(m![1]) }).first();
    expect(row.verdict).toBe("off_station");
    expect(Number(row.displacement_m)).toBeCloseTo(148.16, 1);
    expect(Number(row.displacement_bearing_deg)).toBeCloseTo(90, 0);
    expect(row.reporter_email).toBe("skipper@boats.example");
    expect(Number((await db("reports").count({ n: "*" }).first())!.n)).toBe(Number(before!.n) + 1);
    // Confirmation through the outbox, with the signed link.
    const mail = await db("outbox").where({ idempotency_key: `report:${row.id}:received` }).first();
    expect(mail.to_address).toBe("skipper@boats.example");
    expect(mail.body_text).toContain(`/reports/${row.id}?key=${reportLinkKey(row.id)}`);
    expect(mail.body_text).toMatch(/Off station/);
  });

  it("within the swing circle: 8 m off on a 28 m swing by GNSS alongside; 15 m off is inconclusive", async () => {
    const { direct } = await import("~/lib/geo/geodesy");
    const send = async (offsetM: number) => {
      const p = direct(CHARTED.lat, CHARTED.lon, 180, offsetM);
      const res = await call(reportApi.action, json({ aid: aid.id, observation: { method: "gnss", position: { lat: p.lat, lon: p.lon } }, observedAt: pastIso(5), reporter: { email: "ferry@boats.example" } }));
      expect(res.status).toBe(201);
      return res.data.assessment;
    };
    // U = √(9² + 10²) = 13.45 m (GNSS 9 m and the alongside allowance 10 m, both 95%).
    const near = await send(8);
    expect(near.combinedUncertaintyM).toBeCloseTo(Math.hypot(9, 10), 1);
    expect(near.verdict).toBe("within_swing_circle"); // 8 + 13.45 ≤ 28.28
    expect((await send(15)).verdict).toBe("inconclusive"); // 15 + 13.45 > 28.28 > 15 − 13.45
  });
});

describe("bad input: clear messages, text kept", () => {
  const o = radarObservationOf(148.16, 90);
  const good = () => ({ aid: aid.code, observation: { method: "radar", ownPosition: o.ownPosition, rangeNm: o.rangeNm, bearingDeg: o.bearingDeg, bearingRef: "true", rangeScaleNm: 0.75 }, observedAt: pastIso(), reporter: { email: "x@boats.example" } });

  it.each([
    ["a range beyond the range scale", (b: any) => (b.observation.rangeNm = 2), "observation.rangeNm", /beyond the range scale/],
    ["an impossible bearing", (b: any) => (b.observation.bearingDeg = 400), "observation.bearingDeg", /0 to 360/],
    ["a negative range", (b: any) => (b.observation.rangeNm = -1), "observation.rangeNm", /greater than 0/],
    ["a relative bearing without heading", (b: any) => (b.observation.bearingRef = "relative"), "observation.headingTrueDeg", /heading/],
    ["a time in the future", (b: any) => (b.observedAt = new Date(Date.now() + 3600_000).toISOString()), "observedAt", /in the future/],
    ["no e-mail from a guest", (b: any) => delete b.reporter, "reporter.email", /e-mail address/],
    ["an unknown aid", (b: any) => (b.aid = "NOPE-1"), "aid", /no aid NOPE-1/],
    ["a malformed own position", (b: any) => (b.observation.ownPosition = "95°N 3°E"), "observation.ownPosition", /./],
    ["seven photos", (b: any) => (b.photoUploadIds = Array.from({ length: 7 }, () => crypto.randomUUID())), "photoUploadIds", /At most 6 photos/],
  ])("API: %s → 400 naming the field", async (_name, change, field, message) => {
    const body = good();
    change(body);
    const res = await call(reportApi.action, json(body));
    expect(res.status).toBe(400);
    expect(res.data.field).toBe(field);
    expect(res.data.error).toMatch(message);
  });

  it("form: an impossible range is shown beside the range field and every typed value comes back", async () => {
    const n = Number((await db("reports").count({ n: "*" }).first())!.n);
    const res = await call(reportRoute.action, { path: "/report", method: "POST", body: radarForm(o, { "radar.rangeNm": "5" }) });
    expect(res.status).toBe(400);
    expect(res.data.errors["radar.rangeNm"]).toMatch(/beyond the range scale/);
    expect(res.data.values.remarks).toBe("Seen on radar after the gale, light working.");
    expect(res.data.values["radar.ownPosition"]).toBe(o.ownPosition);
    expect(Number((await db("reports").count({ n: "*" }).first())!.n)).toBe(n);
  });
});

describe("photos: checked by content", () => {
  it.each([
    ["a renamed executable", () => img.fakeExecutable(), "holiday.jpg", /Windows program, not a photo/],
    ["a truncated JPEG", () => img.truncatedJpeg(), "cut.jpg", /incomplete/],
    ["enormous pixel dimensions", () => img.hugePng(), "big.png", /30,000 × 30,000 pixels.*64 megapixels/],
    ["a text file named .png", async () => Buffer.from("not an image at all\n".repeat(50)), "notes.png", /not a photo/],
    ["a GIF", async () => Buffer.from("GIF89a" + "\u0000".repeat(100), "latin1"), "anim.gif", /GIF image, not a photo/],
    ["more than 20 MB", async () => Buffer.concat([await img.jpegWithGps({ width: 64, height: 64 }), Buffer.alloc(21 * 1024 * 1024)]), "huge.jpg", /at most 20 MB/],
  ])("upload API refuses %s", async (_n, make, name, message) => {
    const keysBefore = (await listKeys()).length;
    const res = await uploadFile(await make(), name);
    expect(res.status).toBe(400);
    expect(res.data.field).toBe("photo");
    expect(res.data.error).toMatch(message);
    expect((await listKeys()).length).toBe(keysBefore); // nothing stored
  });

  it("the form refuses a bad photo beside the photos field, keeps the text, saves nothing", async () => {
    const n = Number((await db("reports").count({ n: "*" }).first())!.n);
    const fd = radarForm(radarObservationOf(148.16, 90));
    fd.append("photos", new File([new Uint8Array(img.fakeExecutable())], "buoy.jpg", { type: "image/jpeg" }));
    const res = await call(reportRoute.action, { path: "/report", method: "POST", body: fd });
    expect(res.status).toBe(400);
    expect(res.data.errors.photos).toMatch(/Windows program/);
    expect(res.data.values.remarks).toMatch(/after the gale/);
    expect(Number((await db("reports").count({ n: "*" }).first())!.n)).toBe(n);
  });

  it("the form refuses more than six photos", async () => {
    const fd = radarForm(radarObservationOf(148.16, 90));
    const one = await img.png(8, 8);
    for (let i = 0; i < 7; i++) fd.append("photos", new File([new Uint8Array(one)], `p${i}.png`, { type: "image/png" }));
    const res = await call(reportRoute.action, { path: "/report", method: "POST", body: fd });
    expect(res.status).toBe(400);
    expect(res.data.errors.photos).toMatch(/At most 6 photos per report \(you added 7\)/);
  });

  it("accepts JPEG, PNG and WebP; the public copy and thumbnail have no GPS; the original keeps it and is never served", async () => {
    const res = await uploadFile(await img.jpegWithGps({ width: 2400, height: 1800, lat: 55.1921, lon: 3.0123 }));
    expect(res.status, JSON.stringify(res.data)).toBe(201);
    expect(res.data.exif.lat).toBeCloseTo(55.1921, 4);
    expect(res.data.exif.lon).toBeCloseTo(3.0123, 4);
    expect(res.data.exif.takenAt).toBe("2026-11-30T14:05:00Z");
    const id = res.data.id as string;
    for (const size of ["public", "thumb"] as const) {
      const r = await photosRoute.loader({ params: { id, size }, request: new Request(`http://x/photos/${id}/${size}`) } as never);
      expect(r.status).toBe(200);
      expect(r.headers.get("Content-Type")).toBe("image/jpeg");
      expect(r.headers.get("X-Content-Type-Options")).toBe("nosniff");
      const body = Buffer.from(await r.arrayBuffer());
      expect(await exifr.gps(body)).toBeUndefined();
      expect(await exifr.parse(body)).toBeUndefined(); // no EXIF at all
      const sharp = (await import("sharp")).default;
      const meta = await sharp(body).metadata();
      expect(Math.max(meta.width!, meta.height!)).toBe(size === "public" ? 1600 : 320);
    }
    const original = await getObject((await listKeys("originals/")).find((k) => k.includes(id))!);
    expect((await exifr.gps(original!.body))?.latitude).toBeCloseTo(55.1921, 4);
    const r = await photosRoute.loader({ params: { id, size: "original" }, request: new Request("http://x") } as never);
    expect(r.status).toBe(404);
    for (const [buf, type] of [[await img.png(), "image/png"], [await img.webp(), "image/webp"]] as const) {
      const ok = await uploadFile(buf, "x", type);
      expect(ok.status).toBe(201);
    }
  });

  it("a report with a photo whose GPS is far from the typed own position is flagged", async () => {
    const up = await uploadFile(await img.jpegWithGps({ lat: 55.25, lon: 3.15, takenAt: "2020:01:01 10:00:00" }));
    const o = radarObservationOf(148.16, 90);
    const res = await call(reportApi.action, json({ aid: aid.code, observation: { method: "radar", ownPosition: o.ownPosition, rangeNm: o.rangeNm, bearingDeg: o.bearingDeg, rangeScaleNm: 0.75 }, observedAt: pastIso(), reporter: { email: "flags@boats.example" }, photoUploadIds: [up.data.id] }));
    expect(res.status).toBe(201);
    expect(res.data.photoFlags.join(" ")).toMatch(/Photo 1 was taken \d+(\.\d)? km from the own position/);
    expect(res.data.photoFlags.join(" ")).toMatch(/before the observation time/);
    expect(await db("report_photos").where({ report_id: res.data.id }).count({ n: "*" }).first()).toMatchObject({ n: 1 });
    expect(await db("uploads").where({ id: up.data.id }).first()).toBeUndefined();
  });

  it("presigned upload for API clients: PUT, complete, attach", async () => {
    const p = await call(uploadsApi.action, { path: "/api/v1/uploads", method: "POST", body: JSON.stringify({ contentType: "image/jpeg" }), headers: { "Content-Type": "application/json" } });
    expect(p.status).toBe(201);
    // Not yet PUT: completing fails clearly.
    const early = await call(completeApi.action, { path: `/api/v1/uploads/${p.data.id}/complete`, method: "POST", params: { id: p.data.id } });
    expect(early.status).toBe(409);
    const put = await fetch(p.data.upload.url, { method: "PUT", headers: p.data.upload.headers, body: new Uint8Array(await img.jpegWithGps()) });
    expect(put.status).toBe(200);
    const done = await call(completeApi.action, { path: `/api/v1/uploads/${p.data.id}/complete`, method: "POST", params: { id: p.data.id } });
    expect(done.status, JSON.stringify(done.data)).toBe(200);
    expect(done.data.exif.lat).toBeCloseTo(55.1921, 4);
    expect((await listKeys("incoming/")).filter((k) => k.includes(p.data.id))).toEqual([]);
    // A renamed executable PUT to a presigned URL is refused at completion.
    const bad = await call(uploadsApi.action, { path: "/api/v1/uploads", method: "POST", body: JSON.stringify({ contentType: "image/jpeg" }), headers: { "Content-Type": "application/json" } });
    await fetch(bad.data.upload.url, { method: "PUT", headers: bad.data.upload.headers, body: new Uint8Array(img.fakeExecutable()) });
    const refused = await call(completeApi.action, { path: `/api/v1/uploads/${bad.data.id}/complete`, method: "POST", params: { id: bad.data.id } });
    expect(refused.status).toBe(422);
    expect(refused.data.error).toMatch(/Windows program/);
  });
});

describe("object storage stopped mid-submit", () => {
  beforeEach(async () => {
    await s3.restart();
  });

  it("API: photo uploaded, storage stops before the report is sent → 503, nothing saved; after restart the cleanup leaves nothing", async () => {
    const up = await uploadFile(await img.jpegWithGps());
    expect(up.status).toBe(201);
    const id = up.data.id as string;
    const reportsBefore = Number((await db("reports").count({ n: "*" }).first())!.n);
    await s3.stop();
    const o = radarObservationOf(148.16, 90);
    const res = await call(reportApi.action, json({ aid: aid.code, observation: { method: "radar", ownPosition: o.ownPosition, rangeNm: o.rangeNm, bearingDeg: o.bearingDeg, rangeScaleNm: 0.75 }, observedAt: pastIso(), reporter: { email: "outage@boats.example" }, photoUploadIds: [id] }));
    expect(res.status).toBe(503);
    expect(res.data.error).toMatch(/Photo storage cannot be reached.*Nothing was saved/);
    expect(Number((await db("reports").count({ n: "*" }).first())!.n)).toBe(reportsBefore);
    expect(await db("report_photos").where({ id }).first()).toBeUndefined();
    expect(await db("outbox").where("to_address", "outage@boats.example").first()).toBeUndefined();
    // Still listed as a pending upload, so the worker will remove it if it is never attached.
    expect(await db("uploads").where({ id }).first()).toBeDefined();
    await s3.restart();
    const removed = await cleanupExpiredUploads({ now: new Date(Date.now() + 7 * 3600_000) });
    expect(removed.removed).toBeGreaterThanOrEqual(1);
    expect((await listKeys()).filter((k) => k.includes(id))).toEqual([]);
    expect(await db("uploads").where({ id }).first()).toBeUndefined();
  });

  it("form without JavaScript: storage down while the photo is stored → clear error, text kept, nothing saved or orphaned", async () => {
    const reportsBefore = Number((await db("reports").count({ n: "*" }).first())!.n);
    const uploadsBefore = (await db("uploads").pluck("id")) as string[];
    await s3.stop();
    const fd = radarForm(radarObservationOf(148.16, 90));
    fd.append("photos", new File([new Uint8Array(await img.jpegWithGps())], "buoy.jpg", { type: "image/jpeg" }));
    const res = await call(reportRoute.action, { path: "/report", method: "POST", body: fd });
    expect(res.status).toBe(503);
    expect(res.data.errors.form).toMatch(/Photo storage cannot be reached/);
    expect(res.data.values.remarks).toMatch(/after the gale/);
    expect(res.data.values["radar.ownPosition"]).toBeTruthy();
    expect(Number((await db("reports").count({ n: "*" }).first())!.n)).toBe(reportsBefore);
    // The row written before the objects is already expired: the cleanup will remove it.
    const fresh = (await db("uploads").whereNotIn("id", uploadsBefore.length ? uploadsBefore : [""])) as { id: string; expires_at: Date }[];
    expect(fresh).toHaveLength(1);
    expect(new Date(fresh[0]!.expires_at).getTime()).toBeLessThan(Date.now());
    await s3.restart();
    await cleanupExpiredUploads();
    expect(await db("uploads").where({ id: fresh[0]!.id }).first()).toBeUndefined();
    expect((await listKeys()).filter((k) => k.includes(fresh[0]!.id))).toEqual([]);
  });

  it("every object in the bucket belongs to an attached photo or a listed pending upload", async () => {
    await cleanupExpiredUploads({ now: new Date(Date.now() + 7 * 3600_000) });
    const keys = await listKeys();
    const attached = (await db("report_photos").select("original_key", "public_key", "thumb_key")).flatMap((r) => Object.values(r));
    const pending = (await db("uploads").select("original_key", "public_key", "thumb_key", "incoming_key")).flatMap((r) => Object.values(r)).filter(Boolean);
    const known = new Set([...attached, ...pending]);
    expect(keys.filter((k) => !known.has(k))).toEqual([]);
  });
});

describe("following a report (IDOR)", () => {
  it("the owner, staff and a guest with the signed link can; anyone else gets 404", async () => {
    const owner = await signedInAs("boater");
    const other = await signedInAs("boater");
    const officer = await signedInAs("officer");
    const o = radarObservationOf(148.16, 90);
    const res = await call(reportApi.action, json({ aid: aid.code, observation: { method: "radar", ownPosition: o.ownPosition, rangeNm: o.rangeNm, bearingDeg: o.bearingDeg, rangeScaleNm: 0.75 }, observedAt: pastIso() }, owner.cookie));
    expect(res.status, JSON.stringify(res.data)).toBe(201);
    const id = String(res.data.id);
    const get = (cookie?: string, key?: string) => call(detailRoute.loader, { path: `/reports/${id}${key ? `?key=${key}` : ""}`, params: { id }, cookie });
    expect((await get(owner.cookie)).status).toBe(200);
    expect((await get(officer.cookie)).status).toBe(200);
    expect((await get(undefined, reportLinkKey(Number(id)))).status).toBe(200);
    expect((await get(other.cookie)).status).toBe(404);
    expect((await get(undefined)).status).toBe(404);
    expect((await get(undefined, "forged")).status).toBe(404);
    expect((await get(undefined, reportLinkKey(Number(id) + 1))).status).toBe(404);
  });
});
