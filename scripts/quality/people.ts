// Accounts and sessions for the quality suites, written straight into the database the way the
// app writes them (users.password_hash with bcrypt; sessions keyed by the SHA-256 of a random id
// carried in the signed tw_session cookie), so a suite can act as any role without the form.
import { createHash, randomBytes } from "node:crypto";
import bcrypt from "bcryptjs";
import type { Knex } from "knex";
import { createCookie } from "react-router";

export const ROLES = ["boater", "officer", "harbourmaster", "admin"] as const;
export type QualityRole = (typeof ROLES)[number];
export const TESTERS = ["anonymous", ...ROLES] as const;
export type Tester = (typeof TESTERS)[number];

export const PASSWORD = "correct horse battery staple";
let hash: string | undefined;

let counter = 0;
export async function createAccount(db: Knex, role: QualityRole, opts: { verified?: boolean; email?: string } = {}) {
  // Cost 12, as the app uses: computed once per process and shared by every account made here.
  hash ??= await bcrypt.hash(PASSWORD, 12);
  counter += 1;
  const email = opts.email ?? `${role}-${process.pid}-${Date.now()}-${counter}@quality.example`;
  const [id] = await db("users").insert({
    email,
    name: `${role} quality tester ${counter}`,
    role,
    password_hash: hash,
    email_verified_at: opts.verified === false ? null : new Date(),
  });
  return { id: Number(id), email, role };
}

/** A live session row for the user and the Cookie header value that carries it. */
export async function sessionCookie(db: Knex, sessionSecret: string, userId: number): Promise<string> {
  const id = randomBytes(32).toString("base64url");
  await db("sessions").insert({
    id_hash: createHash("sha256").update(id).digest("hex"),
    user_id: userId,
    data: JSON.stringify({ userId }),
    expires_at: new Date(Date.now() + 24 * 3600_000),
  });
  const cookie = createCookie("tw_session", { secrets: [sessionSecret], path: "/", httpOnly: true, sameSite: "lax" });
  return (await cookie.serialize(id)).split(";")[0];
}

/** One account and cookie per role; `anonymous` is the empty cookie. */
export async function cookiesByRole(db: Knex, sessionSecret: string): Promise<Record<Tester, string> & { ids: Record<QualityRole, number> }> {
  const out = { anonymous: "" } as Record<Tester, string> & { ids: Record<QualityRole, number> };
  out.ids = {} as Record<QualityRole, number>;
  for (const role of ROLES) {
    const a = await createAccount(db, role);
    out.ids[role] = a.id;
    out[role] = await sessionCookie(db, sessionSecret, a.id);
  }
  return out;
}
