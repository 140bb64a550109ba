// Triage: the queue order, status changes with history and mail, the aid's status following a
// confirmed report, several reports combined with outliers flagged, a notice drafted from the
// reports, and the reports closed once it is published. Also the aids register CSV import.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db.server";
import { direct } from "~/lib/geo/geodesy";
import { aidStatusHistory, getAid, importAids } from "~/models/aid.server";
import { getNotice, publishNotice } from "~/models/notice.server";
import { closeReportsForNotice, closeReportsOfPublishedNotices, reportEvents, triageQueue } from "~/models/report.server";
import * as aidPage from "~/routes/staff.reports.aid";
import * as queuePage from "~/routes/staff.reports";
import * as importPage from "~/routes/staff.aids.import";
import * as geojson from "~/routes/api.v1.aids";
import * as reportApi from "~/routes/api.v1.reports";
import { validateCsvRows } from "~/lib/aids/schema";
import { call, signedInAs } from "../support/routes";
import { CHARTED, ensureHarbour, makeAid, pastIso, privateS3, radarObservationOf } from "./reports-fixtures";

let s3: Awaited<ReturnType<typeof privateS3>>;
let harbourId: number;
beforeAll(async () => {
  s3 = await privateS3();
  harbourId = (await ensureHarbour()).id;
});
afterAll(async () => {
  await s3.close();
});

async function send(body: Record<string, unknown>, cookie?: string) {
  const res = await call(reportApi.action, {
    path: "/api/v1/reports",
    method: "POST",
    body: JSON.stringify({ observedAt: pastIso(), reporter: { email: `r${Math.random().toString(36).slice(2)}@boats.example` }, ...body }),
    headers: { "Content-Type": "application/json" },
    cookie,
  });
  expect(res.status, JSON.stringify(res.data)).toBe(201);
  return res.data as { id: number; reference: string; assessment: any };
}

const radar = (code: string, offsetM: number, bearing = 90) => {
  const o = radarObservationOf(offsetM, bearing);
  return { aid: code, observation: { method: "radar", ownPosition: o.ownPosition, rangeNm: o.rangeNm, bearingDeg: o.bearingDeg, bearingRef: "true", rangeScaleNm: o.rangeScaleNm } };
};
const gnss = (code: string, offsetM: number, bearing = 90) => {
  const p = direct(CHARTED.lat, CHARTED.lon, bearing, offsetM);
  return { aid: code, observation: { method: "gnss", position: { lat: p.lat, lon: p.lon } } };
};

const form = (fields: Record<string, string | string[]>) => {
  const fd = new URLSearchParams();
  for (const [k, v] of Object.entries(fields)) for (const x of Array.isArray(v) ? v : [v]) fd.append(k, x);
  return fd;
};

describe("triage", () => {
  it("the queue puts off-station reports first, oldest first within a verdict", async () => {
    const a = await makeAid(harbourId);
    const within = await send(gnss(a.code, 3));
    const off1 = await send(radar(a.code, 150));
    const off2 = await send(radar(a.code, 160));
    await db("reports").where({ id: off2.id }).update({ created_at: new Date(Date.now() - 3600_000) });
    const q = (await triageQueue()).filter((r) => [within.id, off1.id, off2.id].includes(r.id)).map((r) => r.id);
    expect(q).toEqual([off2.id, off1.id, within.id]);
  });

  it("a boater cannot see the queue or an aid's reports; an officer can", async () => {
    const boater = await signedInAs("boater");
    const officer = await signedInAs("officer");
    expect((await call(queuePage.loader, { path: "/staff/reports", cookie: boater.cookie })).status).toBe(403);
    expect((await call(queuePage.loader, { path: "/staff/reports", cookie: officer.cookie })).status).toBe(200);
    expect((await call(aidPage.action, { path: "/staff/reports/aid/1", params: { aidId: "1" }, method: "POST", body: form({ intent: "status", reportId: "1", to: "confirmed" }), cookie: boater.cookie })).status).toBe(403);
  });

  it("status changes: each in one transaction with an event and a mail; confirm sets the aid off station with history; bad transitions refused", async () => {
    const a = await makeAid(harbourId);
    const r = await send(radar(a.code, 150));
    const officer = await signedInAs("officer");
    const post = (fields: Record<string, string>) =>
      call(aidPage.action, { path: `/staff/reports/aid/${a.id}`, params: { aidId: String(a.id) }, method: "POST", body: form(fields), cookie: officer.cookie });

    expect((await post({ intent: "status", reportId: String(r.id), to: "acknowledged" })).status).toBe(302);
    const bad = await post({ intent: "status", reportId: String(r.id), to: "closed" });
    expect(bad.status).toBe(400);
    expect(bad.data.errors.status).toMatch(/acknowledged cannot become closed/);
    expect((await post({ intent: "status", reportId: String(r.id), to: "confirmed", aidStatus: "off_station", note: "Seen by the pilot launch" })).status).toBe(302);

    const row = await db("reports").where({ id: r.id }).first();
    expect(row.status).toBe("confirmed");
    expect((await reportEvents(r.id)).map((e) => e.toStatus)).toEqual(["new", "acknowledged", "confirmed"]);
    const mails = await db("outbox").where("idempotency_key", "like", `report:${r.id}:%`).orderBy("id");
    expect(mails.map((m: { kind: string }) => m.kind)).toEqual(["report_received", "report_status", "report_status"]);
    expect(mails[2].subject).toMatch(/confirmed/);
    expect(mails[2].body_text).toMatch(/now recorded as off station/);
    expect((await getAid(a.id))!.status).toBe("off_station");
    const h = await aidStatusHistory(a.id);
    expect(h[0]).toMatchObject({ fromStatus: "operating", toStatus: "off_station", reportId: r.id });
    expect(h[0]!.reason).toMatch(/confirmed: Seen by the pilot launch/);

    // Duplicate of: needs an existing original.
    const r2 = await send(radar(a.code, 152));
    const nodup = await post({ intent: "status", reportId: String(r2.id), to: "duplicate", duplicateOf: "999999" });
    expect(nodup.status).toBe(400);
    expect(nodup.data.errors.duplicateOfId).toMatch(/no report R-999999/);
    expect((await post({ intent: "status", reportId: String(r2.id), to: "duplicate", duplicateOf: String(r.id) })).status).toBe(302);
    expect((await db("reports").where({ id: r2.id }).first()).duplicate_of_id).toBe(r.id);
    expect((await post({ intent: "status", reportId: String(r2.id), to: "closed" })).status).toBe(302);
    expect((await db("reports").where({ id: r2.id }).first())).toMatchObject({ status: "closed", closed_reason: "no_action" });
  });

  it("several reports of one aid combine into one estimate; a far-off report is flagged as an outlier", async () => {
    const a = await makeAid(harbourId);
    const officer = await signedInAs("officer");
    await send(radar(a.code, 148.16)); // fishing skipper, radar 0.08 M east
    await send(gnss(a.code, 145)); // ferry, GNSS alongside
    await send(gnss(a.code, 150, 92));
    const wild = await send(gnss(a.code, 900, 200)); // a report of the wrong buoy
    const res = await call(aidPage.loader, { path: `/staff/reports/aid/${a.id}`, params: { aidId: String(a.id) }, cookie: officer.cookie });
    expect(res.status).toBe(200);
    const c = res.data.combined;
    expect(c.verdict).toBe("off_station");
    expect(c.estimate.observationsUsed).toBe(3);
    expect(c.displacement.distanceM).toBeGreaterThan(140);
    expect(c.displacement.distanceM).toBeLessThan(155);
    // The combined estimate is tighter than any single GNSS report (13.45 m): uncertainty shrinks.
    expect(c.estimate.uncertaintyM).toBeLessThan(13.45);
    const flagged = res.data.reports.filter((r: { consistent: boolean | null }) => r.consistent === false).map((r: { id: number }) => r.id);
    expect(flagged).toEqual([wild.id]);
  });

  it("draft a notice from the reports, publish it: detail type 51, REPORTED, linked; the reports close by the notice with mail", async () => {
    const a = await makeAid(harbourId);
    const r1 = await send(radar(a.code, 148.16));
    const r2 = await send(gnss(a.code, 146));
    const officer = await signedInAs("officer");
    const res = await call(aidPage.action, {
      path: `/staff/reports/aid/${a.id}`,
      params: { aidId: String(a.id) },
      method: "POST",
      body: form({ intent: "draft-notice", aidId: String(a.id), reportIds: [String(r1.id), String(r2.id)] }),
      cookie: officer.cookie,
    });
    expect(res.status, JSON.stringify(res.data)).toBe(302);
    const noticeId = Number(/\/staff\/notices\/(\d+)/.exec(res.location!)![1]);
    const n = await db("notices").where({ id: noticeId }).first();
    expect(n.status).toBe("draft");
    expect(JSON.parse(n.detail_types)).toEqual([51]);
    expect(n.general_type).toBe("aids_to_navigation_changes");
    expect(n.position_status).toBe("reported");
    expect(n.urgency).toBe("urgent");
    expect(n.body).toMatch(/REPORTED IN 55-11\.\d\dN 003-00\.\d\dE, 0\.08 M E OF CHARTED POSITION/);
    expect(n.body).toMatch(/CHARTED POSITION 55-11\.52N 003-00\.83E/);
    expect((await db("notice_reports").where({ notice_id: noticeId }).pluck("report_id")).sort()).toEqual([r1.id, r2.id].sort());
    expect((await db("notice_aids").where({ notice_id: noticeId }).pluck("aid_id"))).toEqual([a.id]);

    const hm = await signedInAs("harbourmaster");
    const view = await getNotice(noticeId);
    await publishNotice(noticeId, view!.version, { id: hm.user.id, role: "harbourmaster" });
    // Closed in the publishing transaction (onNoticeEvent); the worker's sweep finds nothing left.
    expect(await closeReportsOfPublishedNotices()).toBe(0);
    for (const r of [r1, r2]) {
      const row = await db("reports").where({ id: r.id }).first();
      expect(row).toMatchObject({ status: "closed", closed_reason: "notice", notice_id: noticeId });
      const last = await db("outbox").where("idempotency_key", "like", `report:${r.id}:event:%`).orderBy("id", "desc").first();
      expect(last.body_text).toMatch(/navigational warning has been published/);
    }
    expect((await getAid(a.id))!.status).toBe("off_station");
  });
});

describe("closing inside the notices transaction", () => {
  it("closeReportsForNotice (for the publish hook) confirms and closes the linked reports in the caller's transaction", async () => {
    const a = await makeAid(harbourId);
    const r = await send(radar(a.code, 150));
    const officer = await signedInAs("officer");
    const res = await call(aidPage.action, {
      path: `/staff/reports/aid/${a.id}`,
      params: { aidId: String(a.id) },
      method: "POST",
      body: form({ intent: "draft-notice", aidId: String(a.id), reportIds: [String(r.id)] }),
      cookie: officer.cookie,
    });
    const noticeId = Number(/\/staff\/notices\/(\d+)/.exec(res.location!)![1]);
    // A rolled-back transaction leaves the report as it was.
    await expect(
      db.transaction(async (trx) => {
        await closeReportsForNotice(noticeId, null, trx);
        throw new Error("roll back");
      }),
    ).rejects.toThrow("roll back");
    expect((await db("reports").where({ id: r.id }).first()).status).toBe("new");
    expect(await db.transaction((trx) => closeReportsForNotice(noticeId, null, trx))).toBe(1);
    expect((await reportEvents(r.id)).map((e) => e.toStatus)).toEqual(["new", "draft_notice", "confirmed", "closed"]);
  });
});

describe("aids register", () => {
  const header = "code,name,aid_type,iala_category,iala_region,light_characteristic,charted_position,charted_crs,chain_length_m,depth_m,swing_radius_m,status,remarks";
  it("CSV import: a bad row means nothing is imported; a clean file imports all rows", async () => {
    const officer = await signedInAs("officer");
    const tag = Math.random().toString(36).slice(2, 6).toUpperCase();
    const good = `IMP${tag}1,Import test 1,buoy,port,A,Fl R 5s,55°11.60′N 003°00.70′E,EPSG:4326,30,10,,operating,`;
    const bad = `IMP${tag}2,Import test 2,buoy,port,A,Fl(2 R 10s,55°11.70′N 003°00.70′E,EPSG:4326,30,10,,operating,`;
    const send = (csvText: string, intent: string) => {
      const fd = new FormData();
      fd.append("intent", intent);
      fd.append("csvText", csvText);
      return call(importPage.action, { path: "/staff/aids/import", method: "POST", body: fd, cookie: officer.cookie });
    };
    const preview = await send([header, good, bad].join("\n"), "preview");
    expect(preview.status).toBe(400);
    expect(preview.data.rows[1]).toMatchObject({ line: 3, ok: false });
    expect(preview.data.rows[1].errors[0].message).toMatch(/closing bracket/);
    const commit = await send([header, good, bad].join("\n"), "commit");
    expect(commit.status).toBe(400);
    expect(commit.data.error).toMatch(/Nothing was imported/);
    expect(await db("aids").where("code", "like", `IMP${tag}%`).count({ n: "*" }).first()).toMatchObject({ n: 0 });
    const fixed = bad.replace("Fl(2 R", "Fl(2) R");
    expect((await send([header, good, fixed].join("\n"), "commit")).status).toBe(302);
    expect(await db("aids").where("code", "like", `IMP${tag}%`).count({ n: "*" }).first()).toMatchObject({ n: 2 });
  });

  it("importAids rolls back every row when one fails in the database", async () => {
    const tag = Math.random().toString(36).slice(2, 6).toUpperCase();
    const rows = validateCsvRows([
      { code: `RB${tag}1`, name: "Rollback 1", aid_type: "buoy", charted_position: "55°11.6′N 003°00.7′E", swing_radius_m: "10" },
      { code: `RB${tag}2`, name: "Rollback 2".padEnd(200, "x"), aid_type: "buoy", charted_position: "55°11.6′N 003°00.7′E", swing_radius_m: "10" },
    ]);
    // Force a database error on the second row (name longer than the column) to test the rollback.
    const values = rows.map((r, i) => (r.value ? r.value : { ...rows[0]!.value!, code: `RB${tag}${i + 1}`, name: "x".repeat(200) }));
    await expect(importAids(harbourId, values, null)).rejects.toThrow();
    expect(await db("aids").where("code", "like", `RB${tag}%`).count({ n: "*" }).first()).toMatchObject({ n: 0 });
  });

  it("GET /api/v1/aids is GeoJSON with parsed lights and swing radii", async () => {
    const a = await makeAid(harbourId);
    const res = await geojson.loader({ request: new Request("http://x/api/v1/aids") } as never);
    expect(res.headers.get("Content-Type")).toMatch(/application\/geo\+json/);
    const body = await res.json();
    const f = body.features.find((x: { id: string }) => x.id === a.code);
    expect(f.geometry.coordinates[0]).toBeCloseTo(CHARTED.lon, 6);
    expect(f.properties.light).toMatchObject({ rhythm: "Fl", group: [2], colours: ["G"], periodS: 10 });
    expect(f.properties.swingRadiusM).toBeCloseTo(28.284, 2);
  });
});
