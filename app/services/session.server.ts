import { createHash, randomBytes } from "node:crypto";
import { createCookie, createSessionStorage, redirect, type Session } from "react-router";
import { db } from "~/db.server";
import { env } from "~/env.server";

/** Signed-in sessions last 14 days; sign-out or an admin revokes them earlier. */
export const SESSION_TTL_MS = 14 * 24 * 60 * 60 * 1000;
/** Anonymous sessions carry only a one-time toast; keep them short. */
export const ANON_SESSION_TTL_MS = 60 * 60 * 1000;

export type Toast = { kind: "success" | "info" | "error"; message: string };
type SessionData = { userId: number };
type FlashData = { toast: Toast };

// The cookie holds only a random id; the row is looked up by its SHA-256 so a copy of the
// table does not let anyone impersonate a session.
const hashId = (id: string) => createHash("sha256").update(id).digest("hex");

let storage: ReturnType<typeof createSessionStorage<SessionData, FlashData>> | undefined;

export function sessionStorage() {
  if (storage) return storage;
  const e = env();
  const cookie = createCookie("tw_session", {
    httpOnly: true,
    sameSite: "lax",
    secure: e.NODE_ENV === "production",
    path: "/",
    secrets: [e.SESSION_SECRET],
  });
  storage = createSessionStorage<SessionData, FlashData>({
    cookie,
    async createData(data, expires) {
      const id = randomBytes(32).toString("base64url");
      await db("sessions").insert({
        id_hash: hashId(id),
        user_id: (data as SessionData).userId ?? null,
        data: JSON.stringify(data),
        expires_at: expires ?? new Date(Date.now() + ANON_SESSION_TTL_MS),
      });
      return id;
    },
    async readData(id) {
      const row = await db("sessions").where({ id_hash: hashId(id) }).where("expires_at", ">", new Date()).first();
      return row ? JSON.parse(row.data) : null;
    },
    async updateData(id, data, expires) {
      await db("sessions")
        .where({ id_hash: hashId(id) })
        .update({
          data: JSON.stringify(data),
          user_id: (data as SessionData).userId ?? null,
          ...(expires ? { expires_at: expires } : {}),
        });
    },
    async deleteData(id) {
      await db("sessions").where({ id_hash: hashId(id) }).delete();
    },
  });
  return storage;
}

export async function getSession(request: Request) {
  return sessionStorage().getSession(request.headers.get("Cookie"));
}

export async function commitSession(session: Session<SessionData, FlashData>, maxAgeMs?: number) {
  const expires = new Date(Date.now() + (maxAgeMs ?? (session.get("userId") ? SESSION_TTL_MS : ANON_SESSION_TTL_MS)));
  return sessionStorage().commitSession(session, { expires });
}

/** Redirect with a one-time toast shown on the next page. */
export async function redirectWithToast(request: Request, to: string, toast: Toast, init?: ResponseInit) {
  const session = await getSession(request);
  session.flash("toast", toast);
  const headers = new Headers(init?.headers);
  headers.append("Set-Cookie", await commitSession(session));
  return redirect(to, { ...init, headers });
}

/** Revoke every session of a user (password reset, role change, disabling). */
export async function revokeUserSessions(userId: number, trx = db) {
  await trx("sessions").where({ user_id: userId }).delete();
}
