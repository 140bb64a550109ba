// Another user's report or subscription is unreachable by id (the same 404 as for an id that does
// not exist), and uploaded files are never served with an executable content type.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeQdb, qdb } from "../../scripts/quality/db";
import { request } from "../../scripts/quality/http";
import { createAccount, sessionCookie } from "../../scripts/quality/people";
import { fakeExecutable, jpegWithGps, png } from "../support/images";

const base = () => process.env.QUALITY_BASE_URL!;
const secret = () => process.env.SESSION_SECRET!;
afterAll(closeQdb);

let alice: { id: number; email: string; cookie: string };
let bob: { id: number; email: string; cookie: string };
let officer: string;
beforeAll(async () => {
  const a = await createAccount(qdb(), "boater");
  const b = await createAccount(qdb(), "boater");
  alice = { ...a, cookie: await sessionCookie(qdb(), secret(), a.id) };
  bob = { ...b, cookie: await sessionCookie(qdb(), secret(), b.id) };
  officer = await sessionCookie(qdb(), secret(), (await createAccount(qdb(), "officer")).id);
});

describe("IDOR", () => {
  it("another boater's report is a 404, like a report that does not exist", async () => {
    const aid = (await qdb()("aids").orderBy("id").first("code")) as { code: string };
    const created = await request(base(), "/api/v1/reports", {
      cookie: alice.cookie,
      json: { aid: aid.code, observation: { method: "gnss", position: "55°12.31′N 003°02.11′E", accuracyM: 5 }, observedAt: "2026-11-30T09:15:00Z", remarks: "IDOR check: private remark" },
    });
    expect(created.status, created.text).toBe(201);
    const id = created.json.id as number;
    const missing = Number((await qdb()("reports").max({ m: "id" }).first())!.m) + 1000;

    expect((await request(base(), `/reports/${id}`, { cookie: alice.cookie })).status).toBe(200);
    expect((await request(base(), `/reports/${id}`, { cookie: officer })).status).toBe(200);
    for (const [who, cookie] of [["bob", bob.cookie], ["anonymous", ""]] as const) {
      const r = await request(base(), `/reports/${id}`, { cookie });
      const none = await request(base(), `/reports/${missing}`, { cookie });
      expect(r.status, who).toBe(404);
      expect(none.status, who).toBe(404);
      expect(r.text, `${who} sees the remark`).not.toContain("IDOR check: private remark");
      // Client-side navigation path too.
      const d = await request(base(), `/reports/${id}.data`, { cookie });
      expect(d.text, `${who} .data`).not.toContain("IDOR check: private remark");
      expect([404, 202, 200]).toContain(d.status);
      if (d.status === 200) expect(d.text).toMatch(/ErrorResponse.*404|404.*ErrorResponse/s);
      // A forged guest key is no better.
      const forged = await request(base(), `/reports/${id}?key=${"a".repeat(43)}`, { cookie });
      expect(forged.status, `${who} forged key`).toBe(404);
    }
    // Bob's own list does not show it.
    const list = await request(base(), "/account/reports", { cookie: bob.cookie });
    expect(list.text).not.toContain(`/reports/${id}"`);
  });

  it("another user's subscription cannot be ended by id", async () => {
    const harbour = (await qdb()("harbours").first("id")) as { id: number };
    const [subId] = await qdb()("subscriptions").insert({
      email: alice.email,
      user_id: alice.id,
      harbour_id: harbour.id,
      area_kind: "harbour",
      area: qdb().raw("ST_GeomFromText(?, 4326)", ["POLYGON((2.9 55.1,3.2 55.1,3.2 55.3,2.9 55.3,2.9 55.1))"]),
      general_types: "[]",
      status: "confirmed",
      confirmed_at: new Date(),
    });
    const r = await request(base(), "/account/subscriptions", { cookie: bob.cookie, form: { id: String(subId) } });
    expect(r.status).toBe(404);
    expect((await qdb()("subscriptions").where({ id: subId }).first()).status).toBe("confirmed");
    // Bob's page does not list it; Alice's does.
    expect((await request(base(), "/account/subscriptions", { cookie: bob.cookie })).text).not.toContain(`value="${subId}"`);
    expect((await request(base(), "/account/subscriptions", { cookie: alice.cookie })).text).toContain(`value="${subId}"`);
    // Alice can end it herself: the refusal above was about ownership.
    expect((await request(base(), "/account/subscriptions", { cookie: alice.cookie, form: { id: String(subId) } })).status).toBe(302);
    expect((await qdb()("subscriptions").where({ id: subId }).first()).status).toBe("ended");
  });
});

describe("uploaded files", () => {
  const upload = async (bytes: Buffer, name: string, type: string) => {
    const fd = new FormData();
    fd.append("photo", new Blob([new Uint8Array(bytes)], { type }), name);
    return request(base(), "/api/v1/uploads", { method: "POST", body: fd });
  };

  it("files that are not images are refused, whatever their name or declared type", async () => {
    const html = Buffer.from("<!doctype html><script>alert(document.cookie)</script>");
    const svg = Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>');
    for (const [bytes, name, type] of [
      [fakeExecutable(), "photo.jpg", "image/jpeg"],
      [html, "photo.jpg", "image/jpeg"],
      [html, "x.html", "text/html"],
      [svg, "x.svg", "image/svg+xml"],
      [Buffer.from("alert(1)"), "x.js", "application/javascript"],
    ] as const) {
      const r = await upload(bytes, name, type);
      expect(r.status, `${name} ${type}: ${r.text}`).toBe(400);
      expect(r.json).toMatchObject({ error: expect.any(String), field: "photo" });
    }
    const presign = await request(base(), "/api/v1/uploads", { json: { contentType: "text/html" } });
    expect(presign.status).toBe(400);
  });

  it("stored photos are served as images with nosniff, even when uploaded as HTML", async () => {
    for (const [bytes, name, type] of [
      [await jpegWithGps({ lat: 55.2, lon: 3.03 }), "evil.html", "text/html"],
      [await png(), "x.svg", "image/svg+xml"],
    ] as const) {
      const r = await upload(bytes, name, type);
      expect(r.status, r.text).toBe(201);
      for (const url of [r.json.thumbUrl, r.json.publicUrl] as string[]) {
        const got = await fetch(new URL(url, base()));
        const ct = got.headers.get("content-type") ?? "";
        expect(ct, url).toMatch(/^image\/(jpeg|png|webp)$/);
        expect(got.headers.get("x-content-type-options"), url).toBe("nosniff");
        expect(got.headers.get("content-disposition") ?? "inline", url).not.toMatch(/\.html|\.svg/);
        const body = Buffer.from(await got.arrayBuffer());
        // Re-encoded: starts with an image signature, never markup.
        expect(body.subarray(0, 3).toString("hex"), url).toMatch(/^ffd8ff|^89504e|^524946/);
      }
    }
  });
});
