import { db as defaultDb, type Db } from "~/db.server";

// Failed sign-ins are counted per account (e-mail) and per network address over a sliding
// window, in the database so every app instance sees the same counts.
export const THROTTLE_WINDOW_MS = 15 * 60_000;
export const MAX_FAILURES_PER_ACCOUNT = 5;
export const MAX_FAILURES_PER_ADDRESS = 20;

export type ThrottleState = { blocked: false } | { blocked: true; retryAfterS: number };

async function check(scope: "account" | "address", key: string, max: number, db: Db): Promise<ThrottleState> {
  const since = new Date(Date.now() - THROTTLE_WINDOW_MS);
  const rows = await db("login_failures")
    .where({ scope, key })
    .where("created_at", ">", since)
    .orderBy("created_at", "asc")
    .limit(max)
    .select("created_at");
  if (rows.length < max) return { blocked: false };
  const oldest = new Date(rows[0].created_at).getTime();
  return { blocked: true, retryAfterS: Math.max(1, Math.ceil((oldest + THROTTLE_WINDOW_MS - Date.now()) / 1000)) };
}

export async function checkLoginThrottle(email: string, address: string | null, db: Db = defaultDb): Promise<ThrottleState> {
  const account = await check("account", email, MAX_FAILURES_PER_ACCOUNT, db);
  if (account.blocked || !address) return account;
  return check("address", address, MAX_FAILURES_PER_ADDRESS, db);
}

export async function recordLoginFailure(email: string, address: string | null, db: Db = defaultDb) {
  const rows = [{ scope: "account", key: email }];
  if (address) rows.push({ scope: "address", key: address });
  await db("login_failures").insert(rows);
}

export async function clearAccountFailures(email: string, db: Db = defaultDb) {
  await db("login_failures").where({ scope: "account", key: email }).delete();
}
