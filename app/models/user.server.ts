import bcrypt from "bcryptjs";
import { db as defaultDb, type Db } from "~/db.server";
import type { Role } from "~/lib/permissions";

/** bcrypt cost 12: ~250 ms per hash on this class of machine, OWASP's floor is 10. */
export const BCRYPT_COST = 12;

export type User = {
  id: number;
  email: string;
  name: string;
  role: Role;
  emailVerifiedAt: Date | null;
  disabledAt: Date | null;
  createdAt: Date;
};

type UserRow = {
  id: number;
  email: string;
  name: string;
  role: Role;
  password_hash: string | null;
  email_verified_at: Date | null;
  disabled_at: Date | null;
  created_at: Date;
};

const toUser = (r: UserRow): User => ({
  id: r.id,
  email: r.email,
  name: r.name,
  role: r.role,
  emailVerifiedAt: r.email_verified_at,
  disabledAt: r.disabled_at,
  createdAt: r.created_at,
});

export const normaliseEmail = (email: string) => email.trim().toLowerCase();

export async function hashPassword(password: string) {
  return bcrypt.hash(password, BCRYPT_COST);
}

export async function getUserById(id: number, db: Db = defaultDb): Promise<User | null> {
  const row = await db<UserRow>("users").where({ id }).first();
  return row ? toUser(row) : null;
}

export async function getUserByEmail(email: string, db: Db = defaultDb): Promise<User | null> {
  const row = await db<UserRow>("users").where({ email: normaliseEmail(email) }).first();
  return row ? toUser(row) : null;
}

export async function createUser(
  input: { email: string; name: string; role: Role; password?: string | null; verified?: boolean },
  db: Db = defaultDb,
): Promise<User> {
  const [id] = await db("users").insert({
    email: normaliseEmail(input.email),
    name: input.name.trim(),
    role: input.role,
    password_hash: input.password ? await hashPassword(input.password) : null,
    email_verified_at: input.verified ? new Date() : null,
  });
  return (await getUserById(id, db))!;
}

/** Returns the user when the password matches; a constant-ish cost either way. */
export async function verifyLogin(email: string, password: string, db: Db = defaultDb): Promise<User | null> {
  const row = await db<UserRow>("users").where({ email: normaliseEmail(email) }).first();
  // Compare against a dummy hash when the address is unknown so timing does not reveal it.
  const hash = row?.password_hash ?? "$2b$12$BiY2.vdg16U34E7tjlN78uN5gyFix.oP1dpjI1bm1gU1YfQoRqaJC";
  const ok = await bcrypt.compare(password, hash);
  return ok && row && row.password_hash && !row.disabled_at ? toUser(row) : null;
}

export async function setPassword(userId: number, password: string, db: Db = defaultDb) {
  await db("users").where({ id: userId }).update({ password_hash: await hashPassword(password), updated_at: new Date() });
}

export async function markEmailVerified(userId: number, db: Db = defaultDb) {
  await db("users").where({ id: userId }).whereNull("email_verified_at").update({ email_verified_at: new Date() });
}

export async function setRole(userId: number, role: Role, db: Db = defaultDb) {
  await db("users").where({ id: userId }).update({ role, updated_at: new Date() });
}

export async function listUsers(db: Db = defaultDb): Promise<User[]> {
  const rows = await db<UserRow>("users").orderByRaw("FIELD(role, 'admin','harbourmaster','officer','boater')").orderBy("name");
  return rows.map(toUser);
}
