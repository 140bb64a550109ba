// Accounts over HTTP against the production build: CSRF refusals, session fixation and
// revocation, the password hashing cost, the sign-in rate limit, headers and cookie flags.
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { closeQdb, qdb } from "../../scripts/quality/db";
import { request, type Reply } from "../../scripts/quality/http";
import { createAccount, PASSWORD, sessionCookie } from "../../scripts/quality/people";

const base = () => process.env.QUALITY_BASE_URL!;
const EVIL = "https://evil.example";

/** The tw_session=… pair a reply sets (the last live one), or "". */
function setCookie(r: Reply): string {
  const live = r.headers.getSetCookie().filter((c) => c.startsWith("tw_session=") && !/expires=Thu, 01 Jan 1970/i.test(c) && !/^tw_session=;/.test(c));
  return live.at(-1)?.split(";")[0] ?? "";
}

async function signIn(email: string, password: string, cookie?: string, headers?: Record<string, string>) {
  return request(base(), "/sign-in", { form: { email, password }, cookie, headers });
}

afterAll(closeQdb);
// The rate-limit case leaves failures for 127.0.0.1 behind; nothing else may inherit them.
afterEach(async () => {
  await qdb()("login_failures").delete();
  await qdb()("rate_limits").delete().catch(() => undefined);
});

describe("CSRF: cross-origin writes are refused and change nothing", () => {
  it("a sign-up posted from another origin creates no account", async () => {
    const email = `csrf-${Date.now()}@quality.example`;
    const form = { name: "Cross Site", email, password: PASSWORD, confirmPassword: PASSWORD };
    const cross = await request(base(), "/sign-up", { form, origin: EVIL });
    // React Router's own check answers 400 for a mismatching Origin on document POSTs.
    expect([400, 403]).toContain(cross.status);
    const viaFetchSite = await request(base(), "/sign-up", { form, origin: false, headers: { "Sec-Fetch-Site": "cross-site" } });
    expect(viaFetchSite.status).toBe(403);
    const nullOrigin = await request(base(), "/sign-up", { form, origin: "null" });
    expect([400, 403]).toContain(nullOrigin.status);
    expect(await qdb()("users").where({ email }).first()).toBeUndefined();
    // The same form from our own origin does create it: the refusal above was the origin.
    const same = await request(base(), "/sign-up", { form });
    expect(same.status).toBe(302);
    expect(await qdb()("users").where({ email }).first()).toBeDefined();
  });

  it("an admin's role change posted from another origin is refused", async () => {
    const admin = await createAccount(qdb(), "admin");
    const target = await createAccount(qdb(), "boater");
    const cookie = await sessionCookie(qdb(), process.env.SESSION_SECRET!, admin.id);
    const form = { intent: "set-role", userId: String(target.id), role: "admin" };
    for (const o of [{ origin: EVIL }, { origin: false as const, headers: { "Sec-Fetch-Site": "cross-site" } }]) {
      const r = await request(base(), "/admin/users", { form, cookie, ...o });
      expect([400, 403]).toContain(r.status);
    }
    expect((await qdb()("users").where({ id: target.id }).first()).role).toBe("boater");
  });

  it("API writes from another origin get a JSON 403", async () => {
    for (const path of ["/api/v1/assessments", "/api/v1/convert", "/api/v1/notices"]) {
      const r = await request(base(), path, { json: {}, origin: EVIL });
      expect(r.status, path).toBe(403);
      expect(r.json, path).toMatchObject({ error: expect.any(String) });
    }
  });
});

describe("sessions", () => {
  it("signing in replaces a planted session id (fixation)", async () => {
    const user = await createAccount(qdb(), "boater");
    // An anonymous session the attacker could have planted: the flash cookie of a public form.
    const planted = setCookie(await request(base(), "/forgot-password", { form: { email: "nobody@quality.example" } }));
    expect(planted).toMatch(/^tw_session=/);
    const r = await signIn(user.email, PASSWORD, planted);
    expect(r.status).toBe(302);
    const fresh = setCookie(r);
    expect(fresh).toMatch(/^tw_session=/);
    expect(fresh).not.toBe(planted);
    expect((await request(base(), "/account", { cookie: fresh })).status).toBe(200);
    // The planted id is not signed in (and was destroyed).
    const old = await request(base(), "/account", { cookie: planted });
    expect(old.status).toBe(302);
    expect(old.location).toMatch(/^\/sign-in/);
  });

  it("sign-out revokes the session on the server, not only in the browser", async () => {
    const user = await createAccount(qdb(), "boater");
    const cookie = setCookie(await signIn(user.email, PASSWORD));
    expect((await request(base(), "/account", { cookie })).status).toBe(200);
    expect((await request(base(), "/sign-out", { method: "POST", form: {}, cookie })).status).toBe(302);
    // Replaying the old cookie (copied before sign-out) no longer works.
    const replay = await request(base(), "/account", { cookie });
    expect(replay.status).toBe(302);
    expect(replay.location).toMatch(/^\/sign-in/);
    expect(await qdb()("sessions").where({ user_id: user.id }).count({ n: "*" }).first()).toMatchObject({ n: 0 });
  });

  it("a role change by an admin ends the user's live sessions", async () => {
    const admin = await createAccount(qdb(), "admin");
    const target = await createAccount(qdb(), "officer");
    const targetCookie = await sessionCookie(qdb(), process.env.SESSION_SECRET!, target.id);
    expect((await request(base(), "/staff", { cookie: targetCookie })).status).toBe(200);
    const adminCookie = await sessionCookie(qdb(), process.env.SESSION_SECRET!, admin.id);
    const r = await request(base(), "/admin/users", { form: { intent: "set-role", userId: String(target.id), role: "boater" }, cookie: adminCookie });
    expect(r.status).toBe(302);
    const after = await request(base(), "/staff", { cookie: targetCookie });
    expect(after.status).toBe(302);
    expect(after.location).toMatch(/^\/sign-in/);
  });

  it("a disabled account's session stops working", async () => {
    const user = await createAccount(qdb(), "officer");
    const cookie = await sessionCookie(qdb(), process.env.SESSION_SECRET!, user.id);
    await qdb()("users").where({ id: user.id }).update({ disabled_at: new Date() });
    const r = await request(base(), "/staff", { cookie });
    expect(r.status).toBe(302);
    expect(r.location).toMatch(/^\/sign-in/);
  });

  it("a forged cookie (right id, wrong signature) is ignored", async () => {
    const user = await createAccount(qdb(), "admin");
    const good = await sessionCookie(qdb(), process.env.SESSION_SECRET!, user.id);
    const forged = good.replace(/.{4}$/, (s) => (s === "AAAA" ? "BBBB" : "AAAA"));
    const r = await request(base(), "/admin/users", { cookie: forged });
    expect(r.status).toBe(302);
    expect(r.location).toMatch(/^\/sign-in/);
  });
});

describe("passwords", () => {
  it("are stored as bcrypt with cost 12, never as given", async () => {
    const email = `hash-${Date.now()}@quality.example`;
    const r = await request(base(), "/sign-up", { form: { name: "Hash Check", email, password: PASSWORD, confirmPassword: PASSWORD } });
    expect(r.status).toBe(302);
    const row = await qdb()("users").where({ email }).first();
    expect(row.password_hash).toMatch(/^\$2[aby]\$12\$[./A-Za-z0-9]{53}$/);
    expect(row.password_hash).not.toContain(PASSWORD);
  });
});

describe("sign-in rate limit", () => {
  it("after 5 failures for an account, even the right password is refused with 429 and Retry-After", async () => {
    const user = await createAccount(qdb(), "boater");
    for (let i = 0; i < 5; i++) {
      const r = await signIn(user.email, "wrong password " + i);
      expect(r.status).toBe(400);
      expect(r.text).toContain("do not match an account");
    }
    const blocked = await signIn(user.email, PASSWORD);
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers.get("Retry-After"))).toBeGreaterThan(0);
    expect(blocked.text).toContain("Too many failed sign-ins");
    expect(setCookie(blocked)).toBe("");
  });

  it("the per-address limit holds across accounts (20 failures from one address)", async () => {
    for (let i = 0; i < 20; i++) {
      const r = await signIn(`spray-${i}-${Date.now()}@quality.example`, "wrong password");
      expect(r.status).toBe(400);
    }
    const other = await createAccount(qdb(), "boater");
    const blocked = await signIn(other.email, PASSWORD);
    expect(blocked.status).toBe(429);
  });

  it("X-Forwarded-For is not trusted by default (no escaping the limit by header)", async () => {
    const user = await createAccount(qdb(), "boater");
    for (let i = 0; i < 20; i++) await signIn(`xff-${i}-${Date.now()}@quality.example`, "wrong", undefined, { "X-Forwarded-For": `10.0.0.${i}` });
    const blocked = await signIn(user.email, PASSWORD, undefined, { "X-Forwarded-For": "10.9.9.9" });
    expect(blocked.status).toBe(429);
  });
});

describe("per-address limits on anonymous writes", () => {
  it("the 31st report within an hour from one address is refused with 429 and Retry-After", async () => {
    const aid = (await qdb()("aids").orderBy("id").first("code")) as { code: string };
    const body = (i: number) => ({ aid: aid.code, observation: { method: "gnss", position: "55°12.31′N 003°02.11′E", accuracyM: 5 }, observedAt: "2026-11-30T09:15:00Z", remarks: `limit ${i}`, reporter: { email: "limits@boaters.example" } });
    const before = Number((await qdb()("reports").count({ n: "*" }).first())!.n);
    for (let i = 0; i < 30; i++) {
      const r = await request(base(), "/api/v1/reports", { json: body(i) });
      expect(r.status, r.text).toBe(201);
    }
    const over = await request(base(), "/api/v1/reports", { json: body(30) });
    expect(over.status).toBe(429);
    expect(Number(over.headers.get("Retry-After"))).toBeGreaterThan(0);
    expect(over.json).toMatchObject({ error: expect.stringMatching(/Too many/) });
    expect(Number((await qdb()("reports").count({ n: "*" }).first())!.n)).toBe(before + 30);
  });
});

describe("headers and cookie flags", () => {
  beforeAll(() => undefined);

  it("pages carry a nonce CSP without unsafe-inline scripts, nosniff, DENY framing, referrer policy", async () => {
    for (const path of ["/", "/sign-in", "/no-such-page"]) {
      const r = await request(base(), path);
      const h = r.headers;
      const csp = h.get("content-security-policy") ?? "";
      expect(csp, path).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]+'/);
      expect(csp, path).not.toMatch(/script-src[^;]*'unsafe-(inline|eval)'/);
      expect(csp, path).toContain("frame-ancestors 'none'");
      expect(csp, path).toContain("object-src 'none'");
      expect(csp, path).toContain("base-uri 'none'");
      expect(h.get("x-content-type-options"), path).toBe("nosniff");
      expect(h.get("x-frame-options"), path).toBe("DENY");
      expect(h.get("referrer-policy"), path).toBe("strict-origin-when-cross-origin");
      expect(h.get("content-type"), path).toMatch(/^text\/html; charset=utf-8/);
      expect(h.get("x-powered-by"), path).toBeNull();
    }
  });

  it("JSON replies are nosniff and sandboxed", async () => {
    const r = await request(base(), "/healthz");
    expect(r.headers.get("content-type")).toMatch(/^application\/json/);
    expect(r.headers.get("x-content-type-options")).toBe("nosniff");
    expect(r.headers.get("content-security-policy")).toContain("default-src 'none'");
  });

  it("static assets are nosniff with long immutable caching", async () => {
    const page = await request(base(), "/sign-in");
    const asset = /(\/assets\/[^"']+\.js)/.exec(page.text)?.[1];
    expect(asset).toBeTruthy();
    const r = await request(base(), asset!);
    expect(r.status).toBe(200);
    expect(r.headers.get("x-content-type-options")).toBe("nosniff");
    expect(r.headers.get("cache-control")).toContain("immutable");
    expect(r.headers.get("content-type")).toMatch(/javascript/);
  });

  it("the session cookie is HttpOnly, SameSite=Lax, Secure, Path=/ and expires", async () => {
    const user = await createAccount(qdb(), "boater");
    const r = await signIn(user.email, PASSWORD);
    const line = r.headers.getSetCookie().filter((c) => c.startsWith("tw_session=") && !/^tw_session=;/.test(c)).at(-1) ?? "";
    expect(line).toMatch(/; HttpOnly/i);
    expect(line).toMatch(/; SameSite=Lax/i);
    expect(line).toMatch(/; Secure/i);
    expect(line).toMatch(/; Path=\//i);
    expect(line).toMatch(/; Expires=/i);
  });

  it("open redirects: redirectTo to another site lands on our own page", async () => {
    const user = await createAccount(qdb(), "boater");
    for (const to of ["https://evil.example/", "//evil.example/", "/\\evil.example/"]) {
      const r = await request(base(), `/sign-in?redirectTo=${encodeURIComponent(to)}`, { form: { email: user.email, password: PASSWORD, redirectTo: to } });
      expect(r.status).toBe(302);
      expect(r.location, to).toMatch(/^\/(?!\/|\\)/);
    }
  });
});
