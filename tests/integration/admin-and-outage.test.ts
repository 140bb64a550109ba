import { createServer } from "node:net";
import { describe, expect, it } from "vitest";
import { createDb } from "~/db.server";
import { env } from "~/env.server";
import * as acceptInvite from "~/routes/accept-invite";
import * as adminUsers from "~/routes/admin.users";
import * as signIn from "~/routes/sign-in";
import * as staff from "~/routes/staff";
import { db } from "~/db.server";
import { runOutboxOnce } from "~/worker/outbox";
import { linkIn, waitForMail } from "../support/mail";
import { call, cookieFrom, signedInAs } from "../support/routes";

describe("admin: invite staff and change roles", () => {
  it("invites an officer by e-mail; the invitee sets a password and reaches the staff desk", async () => {
    const { cookie } = await signedInAs("admin");
    const email = `new-officer-${Date.now()}@kestrel-sound.example`;
    const bad = await call(adminUsers.action, { path: "/admin/users", cookie, form: { intent: "invite", name: "", email: "nope", role: "boater" } });
    expect(bad.status).toBe(400);
    expect(bad.data.errors).toMatchObject({ name: "Enter your name", email: "Enter a valid e-mail address", role: "Choose a staff role" });

    const res = await call(adminUsers.action, { path: "/admin/users", cookie, form: { intent: "invite", name: "Orla Venn", email, role: "officer" } });
    expect(res.status).toBe(302);
    for (let i = 0; i < 100 && (await runOutboxOnce("test")) > 0; i++);
    const mail = await waitForMail({ to: email, subject: "staff account" });
    const link = new URL(linkIn(mail, "/accept-invite"));
    const token = link.searchParams.get("token")!;
    expect((await call(acceptInvite.loader, { path: link.pathname + link.search })).data.token).toBe(token);
    const done = await call(acceptInvite.action, { path: "/accept-invite", form: { token, password: "orla's new password", confirmPassword: "orla's new password" } });
    expect(done.status).toBe(302);

    const signed = await call(signIn.action, { path: "/sign-in", form: { email, password: "orla's new password", redirectTo: "/staff" } });
    expect(signed.location).toBe("/staff");
    const desk = await call(staff.loader, { path: "/staff", cookie: cookieFrom(signed.headers) });
    expect(desk.status).toBe(200);
    expect(desk.data.role).toBe("officer");
  });

  it("changing a role revokes that user's sessions; an admin cannot demote themself", async () => {
    const admin = await signedInAs("admin");
    const boater = await signedInAs("boater");
    const res = await call(adminUsers.action, { path: "/admin/users", cookie: admin.cookie, form: { intent: "set-role", userId: String(boater.user.id), role: "officer" } });
    expect(res.status).toBe(302);
    expect(await db("sessions").where({ user_id: boater.user.id })).toHaveLength(0);
    expect((await db("users").where({ id: boater.user.id }).first()).role).toBe("officer");

    const self = await call(adminUsers.action, { path: "/admin/users", cookie: admin.cookie, form: { intent: "set-role", userId: String(admin.user.id), role: "boater" } });
    expect(self.status).toBe(400);
    expect((await db("users").where({ id: admin.user.id }).first()).role).toBe("admin");

    const unknownRole = await call(adminUsers.action, { path: "/admin/users", cookie: admin.cookie, form: { intent: "set-role", userId: String(boater.user.id), role: "captain" } });
    expect(unknownRole.status).toBe(400);
  });
});

describe("database outage", () => {
  it("turns an unreachable database into a 503 response, not a crash", async () => {
    // A port with nothing listening: bind one, note it, close it.
    const port = await new Promise<number>((resolve) => {
      const s = createServer().listen(0, "127.0.0.1", () => {
        const p = (s.address() as { port: number }).port;
        s.close(() => resolve(p));
      });
    });
    const dead = createDb({ ...env(), DB_PORT: port });
    try {
      const thrown = await dead.raw("SELECT 1").then(
        () => null,
        (e: unknown) => e,
      );
      expect(thrown).toMatchObject({ type: "DataWithResponseInit", init: { status: 503 } });
    } finally {
      await dead.destroy();
    }
  });
});
