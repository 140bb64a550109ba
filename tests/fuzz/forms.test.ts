// Property-based tests over every form action, over HTTP against the production build. The
// forms are read from the rendered pages (as the role that sees them), then posted with hostile
// values: wrong types, huge strings, Unicode edge cases, SQL and HTML fragments, extra and
// missing fields, broken multipart. Always an answer below 500; a 4xx always carries a message
// (a field error with role="alert", the error page, or JSON { error }); and a refused post
// stores nothing (row counts of the main tables unchanged). FUZZ_RUNS sets runs per form.
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeQdb, qdb } from "../../scripts/quality/db";
import { postForms, type PageForm } from "../../scripts/quality/forms";
import { check, hostileString, RUNS } from "../../scripts/quality/hostile";
import { request, type Reply } from "../../scripts/quality/http";
import { createAccount, sessionCookie, type Tester } from "../../scripts/quality/people";
import { fixtures, type Fixtures } from "../security/fixtures";
import { forgetRateLimits, rowCounts } from "./invariants";

const base = () => process.env.QUALITY_BASE_URL!;

/** Pages whose POST forms are fuzzed, and who sees them. */
const PAGES: Array<{ path: string | ((f: Fixtures) => string | undefined); as: Tester; setup?: (userId: number) => Promise<void> }> = [
  { path: "/sign-in", as: "anonymous" },
  { path: "/sign-up", as: "anonymous" },
  { path: "/forgot-password", as: "anonymous" },
  { path: "/subscribe", as: "anonymous" },
  { path: "/report", as: "anonymous" },
  { path: "/report", as: "boater" },
  { path: "/account/subscriptions", as: "boater", setup: subscriptionFor },
  { path: "/admin/users", as: "admin" },
  { path: "/staff/notices/new", as: "officer" },
  { path: (f) => (f.draftNoticeId ? `/staff/notices/${f.draftNoticeId}/edit` : undefined), as: "harbourmaster" },
  { path: "/staff/reports", as: "officer" },
  { path: (f) => (f.reportId ? `/reports/${f.reportId}` : undefined), as: "officer" },
  { path: "/staff/aids", as: "officer" },
  { path: "/staff/aids/import", as: "officer" },
  { path: (f) => (f.aidId ? `/staff/aids/${f.aidId}` : undefined), as: "officer" },
  { path: "/staff/mail", as: "harbourmaster", setup: failedMail },
];

const SKIP_ACTIONS = new Set(["/sign-out"]);

let fx: Fixtures;
async function cookieFor(as: Tester, setup?: (userId: number) => Promise<void>): Promise<string> {
  if (as === "anonymous") return "";
  const a = await createAccount(qdb(), as);
  await setup?.(a.id);
  return sessionCookie(qdb(), process.env.SESSION_SECRET!, a.id);
}

/** A message that failed for good, so the mail page shows its retry form. */
async function failedMail() {
  await qdb()("outbox").insert({
    idempotency_key: `fuzz-failed-${Date.now()}-${Math.random()}`,
    kind: "alert",
    to_address: "bounced@boaters.example",
    subject: "Fuzz: a failed message",
    body_text: "x",
    headers: "{}",
    status: "failed",
    attempts: 10,
    run_at: new Date(),
    last_error: "550 mailbox unavailable",
  });
}

/** A confirmed whole-harbour subscription of the user, so their page has its forms. */
async function subscriptionFor(userId: number) {
  const user = await qdb()("users").where({ id: userId }).first("email");
  const harbour = await qdb()("harbours").first("id");
  await qdb()("subscriptions").insert({
    email: user.email,
    user_id: userId,
    harbour_id: harbour.id,
    area_kind: "harbour",
    area: qdb().raw("ST_GeomFromText(?, 4326)", ["POLYGON((2.9 55.1,3.2 55.1,3.2 55.3,2.9 55.3,2.9 55.1))"]),
    general_types: "[]",
    status: "confirmed",
    confirmed_at: new Date(),
  });
}

beforeAll(async () => {
  fx = await fixtures(qdb());
});
afterAll(closeQdb);

function hasMessage(r: Reply): boolean {
  if (/^application\/json/.test(r.headers.get("content-type") ?? "")) return typeof r.json?.error === "string" && r.json.error.length > 0;
  return /role="alert"/.test(r.text) || /Error (<!-- -->)?4\d\d/.test(r.text);
}

/** One hostile submission of a form: hidden fields mostly kept, the rest hostile or missing. */
function submission(form: PageForm) {
  const fieldArbs = form.fields.map((f) =>
    fc.oneof(
      { arbitrary: fc.constant(f.type === "hidden" ? f.value : f.options[0] ?? f.value), weight: f.type === "hidden" ? 6 : 1 },
      { arbitrary: hostileString, weight: 4 },
      { arbitrary: fc.constant(undefined), weight: 1 },
      { arbitrary: fc.array(hostileString, { minLength: 2, maxLength: 3 }), weight: 1 },
    ),
  );
  return fc.tuple(fc.tuple(...fieldArbs), fc.option(fc.tuple(hostileString, hostileString), { nil: undefined })).map(([values, extra]) => {
    const pairs: Array<[string, string]> = [];
    form.fields.forEach((f, i) => {
      const v = values[i];
      if (v === undefined) return;
      for (const x of Array.isArray(v) ? v : [v]) pairs.push([f.name, x]);
    });
    if (extra) pairs.push([extra[0].slice(0, 50) || "x", extra[1]]);
    return pairs;
  });
}

async function post(form: PageForm, pairs: Array<[string, string]>, cookie: string): Promise<Reply> {
  if (form.enctype === "multipart/form-data") {
    const fd = new FormData();
    for (const [k, v] of pairs) {
      const field = form.fields.find((f) => f.name === k);
      if (field?.type === "file") fd.append(k, new Blob([v], { type: "image/jpeg" }), "photo.jpg");
      else fd.append(k, v);
    }
    return request(base(), form.action, { method: "POST", body: fd, cookie });
  }
  return request(base(), form.action, { method: "POST", form: pairs, cookie });
}

describe("form actions under hostile input", () => {
  for (const page of PAGES) {
    const name = typeof page.path === "string" ? page.path : page.path.toString().match(/`([^`]+)`/)?.[1] ?? "dynamic page";
    it(`${name} as ${page.as}`, async () => {
      const path = typeof page.path === "function" ? page.path(fx) : page.path;
      expect(path, `no fixture row for ${name}`).toBeTruthy();
      let cookie = await cookieFor(page.as, page.setup);
      const r = await request(base(), path!, { cookie });
      expect(r.status, `GET ${path} as ${page.as}`).toBe(200);
      const forms = postForms(r.text, path!.split("?")[0]).filter((f) => !SKIP_ACTIONS.has(f.action));
      expect(forms.length, `${path} has no POST form`).toBeGreaterThan(0);
      for (const form of forms) {
        await check(
          fc.asyncProperty(submission(form), async (pairs) => {
            // A hostile role change may end our own session: a fresh one each run.
            cookie = await cookieFor(page.as, page.setup);
            await forgetRateLimits(qdb());
            const before = await rowCounts(qdb());
            const res = await post(form, pairs, cookie);
            const what = `${form.label} as ${page.as} → ${res.status}\n${JSON.stringify(pairs).slice(0, 600)}\n${res.text.slice(0, 300)}`;
            expect(res.status, what).toBeLessThan(500);
            if (res.status >= 400) {
              expect(hasMessage(res), `4xx without a message: ${what}`).toBe(true);
              const after = await rowCounts(qdb());
              expect(after, `refused but stored: ${what}`).toEqual(before);
            }
          }),
          { numRuns: RUNS },
        );
      }
    });
  }
});

describe("bodies that are not forms", () => {
  const broken: Array<{ name: string; headers: Record<string, string>; body: string }> = [
    { name: "multipart without boundary", headers: { "Content-Type": "multipart/form-data" }, body: "--x\r\nContent-Disposition: form-data; name=\"a\"\r\n\r\n1\r\n--x--" },
    { name: "truncated multipart", headers: { "Content-Type": "multipart/form-data; boundary=zz" }, body: "--zz\r\nContent-Disposition: form-data; name=\"email\"\r\n\r\nabc" },
    { name: "multipart with a bad part header", headers: { "Content-Type": "multipart/form-data; boundary=zz" }, body: "--zz\r\nContent-Disposition: nonsense\r\n\r\nabc\r\n--zz--\r\n" },
    { name: "JSON to a form", headers: { "Content-Type": "application/json" }, body: '{"email":"a@b.example"}' },
    { name: "XML to a form", headers: { "Content-Type": "application/xml" }, body: "<?xml version=\"1.0\"?><!DOCTYPE x [<!ENTITY e SYSTEM \"file:///etc/passwd\">]><x>&e;</x>" },
    { name: "urlencoded with broken escapes", headers: { "Content-Type": "application/x-www-form-urlencoded" }, body: "email=%E0%A4%A&password=%zz&%%%=1" },
  ];
  for (const page of PAGES) {
    const name = typeof page.path === "string" ? page.path : "dynamic page";
    it(`${name} as ${page.as}`, async () => {
      const path = typeof page.path === "function" ? page.path(fx) : page.path;
      expect(path, `no fixture row for ${name}`).toBeTruthy();
      const cookie = await cookieFor(page.as, page.setup);
      const forms = postForms((await request(base(), path!, { cookie })).text, path!.split("?")[0]).filter((f) => !SKIP_ACTIONS.has(f.action));
      for (const form of forms) {
        for (const b of broken) {
          await forgetRateLimits(qdb());
          const before = await rowCounts(qdb());
          const res = await request(base(), form.action, { method: "POST", headers: b.headers, body: b.body, cookie });
          const what = `${b.name} to ${form.label} → ${res.status} ${res.text.slice(0, 200)}`;
          expect(res.status, what).toBeLessThan(500);
          if (res.status >= 400) expect(hasMessage(res), what).toBe(true);
          expect(await rowCounts(qdb()), what).toEqual(before);
        }
      }
    });
  }
});
