import { describe, expect, it } from "vitest";
import { db } from "~/db.server";
import { MAX_FAILURES_PER_ACCOUNT } from "~/models/login-throttle.server";
import { BCRYPT_COST, createUser } from "~/models/user.server";
import { getOptionalUser } from "~/services/auth.server";
import { commitSession, sessionStorage } from "~/services/session.server";
import { runOutboxOnce } from "~/worker/outbox";
import * as signUp from "~/routes/sign-up";
import * as signIn from "~/routes/sign-in";
import * as signOut from "~/routes/sign-out";
import * as verifyEmail from "~/routes/verify-email";
import * as forgot from "~/routes/forgot-password";
import * as reset from "~/routes/reset-password";
import * as account from "~/routes/account";
import { call, cookieFrom, signedInAs } from "../support/routes";
import { linkIn, waitForMail } from "../support/mail";

/** Drains everything due in the outbox (other files may have left mail queued ahead of ours). */
async function deliver() {
  for (let i = 0; i < 100 && (await runOutboxOnce("test-worker")) > 0; i++);
}
const unique = (p: string) => `${p}-${Date.now()}-${Math.round(Math.random() * 1e6)}@test.example`;

describe("sign-up, verification and sign-in", () => {
  it("creates an account whose link arrives by e-mail, then signs in", async () => {
    const email = unique("newboater");
    const res = await call(signUp.action, { path: "/sign-up", form: { name: "Nell Skerry", email, password: "a long pass phrase", confirmPassword: "a long pass phrase" } });
    expect(res.status).toBe(302);

    // Not verified yet: sign-in refused with the reason.
    const early = await call(signIn.action, { path: "/sign-in", form: { email, password: "a long pass phrase" } });
    expect(early.status).toBe(400);
    expect(early.data.errors.email).toMatch(/Confirm your e-mail/);

    await deliver();
    const mail = await waitForMail({ to: email, subject: "Confirm your e-mail" });
    const link = new URL(linkIn(mail, "/verify-email"));
    const verified = await call(verifyEmail.loader, { path: link.pathname + link.search });
    expect(verified.status).toBe(302);
    expect(verified.location).toBe("/sign-in");
    // Single use: the same link fails the second time.
    const again = await call(verifyEmail.loader, { path: link.pathname + link.search });
    expect(again.data).toEqual({ ok: false });

    const ok = await call(signIn.action, { path: "/sign-in", form: { email, password: "a long pass phrase", redirectTo: "/account" } });
    expect(ok.status).toBe(302);
    expect(ok.location).toBe("/account");
    const cookie = cookieFrom(ok.headers);
    const page = await call(account.loader, { path: "/account", cookie });
    expect(page.data.user.email).toBe(email);
  });

  it("rejects bad sign-up input with field errors and keeps the values", async () => {
    const res = await call(signUp.action, { path: "/sign-up", form: { name: "", email: "not-an-address", password: "short", confirmPassword: "other" } });
    expect(res.status).toBe(400);
    expect(res.data.errors).toMatchObject({ name: expect.any(String), email: "Enter a valid e-mail address", password: "Use at least 10 characters" });
    expect(res.data.values.email).toBe("not-an-address");
    expect(res.data.values.password).toBeUndefined(); // passwords are never echoed back
  });

  it("does not reveal whether an address already has an account", async () => {
    const email = unique("taken");
    await createUser({ email, name: "Existing", role: "boater", password: "existing password", verified: true });
    const res = await call(signUp.action, { path: "/sign-up", form: { name: "Imposter", email, password: "a long pass phrase", confirmPassword: "a long pass phrase" } });
    expect(res.status).toBe(302);
    expect(await db("users").where({ email }).count({ n: "*" })).toEqual([{ n: 1 }]);
  });

  it("refuses a body that is not a form with 400, not 500", async () => {
    const res = await call(signUp.action, { path: "/sign-up", method: "POST", body: "{not json", headers: { "Content-Type": "application/json" } });
    expect(res.status).toBe(400);
  });
});

describe("password reset", () => {
  it("resets by a single-use e-mailed token and revokes old sessions", async () => {
    const { user, cookie } = await signedInAs("boater");
    expect((await call(account.loader, { path: "/account", cookie })).status).toBe(200);
    const before = new Date();
    await call(forgot.action, { path: "/forgot-password", form: { email: user.email } });
    await deliver();
    const mail = await waitForMail({ to: user.email, subject: "Reset", after: before });
    const link = new URL(linkIn(mail, "/reset-password"));
    const token = link.searchParams.get("token")!;
    expect((await call(reset.loader, { path: link.pathname + link.search })).data.token).toBe(token);

    const mismatch = await call(reset.action, { path: "/reset-password", form: { token, password: "brand new password", confirmPassword: "different" } });
    expect(mismatch.status).toBe(400);
    expect(mismatch.data.errors.confirmPassword).toBe("The two passwords differ");

    const done = await call(reset.action, { path: "/reset-password", form: { token, password: "brand new password", confirmPassword: "brand new password" } });
    expect(done.status).toBe(302);
    // The old session is gone.
    const stale = await call(account.loader, { path: "/account", cookie });
    expect(stale.status).toBe(302);
    expect(stale.location).toMatch(/^\/sign-in/);
    // The token cannot be used twice.
    const reuse = await call(reset.action, { path: "/reset-password", form: { token, password: "another password!", confirmPassword: "another password!" } });
    expect(reuse.status).toBe(400);
    const signin = await call(signIn.action, { path: "/sign-in", form: { email: user.email, password: "brand new password" } });
    expect(signin.status).toBe(302);
  });

  it("expires reset tokens after their lifetime", async () => {
    const { user } = await signedInAs("boater");
    await call(forgot.action, { path: "/forgot-password", form: { email: user.email } });
    await db("user_tokens").where({ user_id: user.id }).update({ expires_at: new Date(Date.now() - 1000) });
    const row = await db("outbox").where({ to_address: user.email }).orderBy("id", "desc").first();
    const token = /token=([A-Za-z0-9_-]+)/.exec(row.body_text)![1];
    expect((await call(reset.loader, { path: `/reset-password?token=${token}` })).data.token).toBeNull();
  });
});

describe("sessions", () => {
  it("stores only a hash of the cookie's id, expires and can be revoked by sign-out", async () => {
    const { user, cookie } = await signedInAs("boater");
    const id = decodeURIComponent(cookie.split("=")[1]);
    const rows = await db("sessions").where({ user_id: user.id });
    expect(rows).toHaveLength(1);
    expect(rows[0].id_hash).not.toContain(id.slice(0, 10));
    const request = new Request("http://127.0.0.1/account", { headers: { Cookie: cookie } });
    expect((await getOptionalUser(request))?.id).toBe(user.id);

    // Expiry: a session past its time is not accepted.
    await db("sessions").where({ user_id: user.id }).update({ expires_at: new Date(Date.now() - 1000) });
    expect(await getOptionalUser(new Request("http://127.0.0.1/account", { headers: { Cookie: cookie } }))).toBeNull();
  });

  it("signs out with an action that deletes the session row", async () => {
    const { user, cookie } = await signedInAs("officer");
    const res = await call(signOut.action, { path: "/sign-out", method: "POST", cookie, form: {} });
    expect(res.status).toBe(302);
    expect(await db("sessions").where({ user_id: user.id })).toHaveLength(0);
    expect((await call(account.loader, { path: "/account", cookie })).status).toBe(302);
  });

  it("issues a new session id at sign-in and discards the planted one (no fixation)", async () => {
    const email = unique("fixation");
    await createUser({ email, name: "Fix", role: "boater", password: "a long pass phrase", verified: true });
    // An attacker's anonymous session id, planted in the victim's browser.
    const planted = await sessionStorage().getSession();
    planted.flash("toast", { kind: "info", message: "x" });
    const plantedCookie = (await commitSession(planted)).split(";")[0];
    const before = await db("sessions").count({ n: "*" });
    const res = await call(signIn.action, { path: "/sign-in", form: { email, password: "a long pass phrase" }, cookie: plantedCookie });
    expect(res.status).toBe(302);
    const newCookie = cookieFrom(res.headers);
    expect(newCookie).toMatch(/^tw_session=/);
    expect(newCookie).not.toBe(plantedCookie);
    // The planted id no longer reads as any session; the new one is the signed-in user.
    expect(await getOptionalUser(new Request("http://127.0.0.1/", { headers: { Cookie: plantedCookie } }))).toBeNull();
    expect((await getOptionalUser(new Request("http://127.0.0.1/", { headers: { Cookie: newCookie } })))?.email).toBe(email);
    expect(await db("sessions").count({ n: "*" })).toEqual(before); // one removed, one added
  });
});

describe("sign-in throttling", () => {
  it("slows repeated failures per account, persisted in the database", async () => {
    const email = unique("throttled");
    await createUser({ email, name: "T", role: "boater", password: "the right password", verified: true });
    for (let i = 0; i < MAX_FAILURES_PER_ACCOUNT; i++) {
      const bad = await call(signIn.action, { path: "/sign-in", form: { email, password: `wrong ${i}` } });
      expect(bad.status).toBe(400);
    }
    const blocked = await call(signIn.action, { path: "/sign-in", form: { email, password: "the right password" } });
    expect(blocked.status).toBe(429);
    expect(blocked.data.errors.form).toMatch(/Too many failed sign-ins/);
    expect(Number(blocked.headers.get("Retry-After"))).toBeGreaterThan(0);
    expect(await db("login_failures").where({ scope: "account", key: email }).count({ n: "*" })).toEqual([{ n: MAX_FAILURES_PER_ACCOUNT }]);
  });

  it("hashes new passwords with bcrypt cost 12", async () => {
    const user = await createUser({ email: unique("cost"), name: "C", role: "boater", password: "some password" });
    const row = await db("users").where({ id: user.id }).first();
    expect(row.password_hash).toMatch(new RegExp(`^\\$2[aby]\\$${BCRYPT_COST}\\$`));
  });
});
