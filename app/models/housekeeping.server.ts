import { db as defaultDb, type Db } from "~/db.server";
import { THROTTLE_WINDOW_MS } from "./login-throttle.server";

/** Deletes rows that no longer mean anything; returns how many went. */
export async function housekeeping(db: Db = defaultDb): Promise<number> {
  const now = new Date();
  const sessions = await db("sessions").where("expires_at", "<=", now).delete();
  const failures = await db("login_failures").where("created_at", "<", new Date(now.getTime() - THROTTLE_WINDOW_MS)).delete();
  const limits = await db("rate_limits").where("expire", "<", now.getTime()).delete();
  return sessions + failures + limits;
}
