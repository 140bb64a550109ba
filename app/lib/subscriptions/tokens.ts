// Signed, expiring tokens for links in subscription mail: confirm, manage, unsubscribe.
// Format: base64url(JSON payload) "." base64url(HMAC-SHA256(secret, purpose + "." + payload)).
// The subscription is named only inside the signed payload; a forged or expired token is
// refused with one message whatever it names, so it tells nothing about any address.
import { createHmac, timingSafeEqual } from "node:crypto";

export type TokenPurpose = "confirm" | "manage" | "unsubscribe";

/** Confirmation links expire with the pending request (72 h); mail links last 90 days. */
export const CONFIRM_TOKEN_TTL_MS = 72 * 3600_000;
export const MANAGE_TOKEN_TTL_MS = 90 * 24 * 3600_000;

export const TOKEN_TTL_MS: Record<TokenPurpose, number> = {
  confirm: CONFIRM_TOKEN_TTL_MS,
  manage: MANAGE_TOKEN_TTL_MS,
  unsubscribe: MANAGE_TOKEN_TTL_MS,
};

type Payload = { s: number; e: number };

const b64 = (buf: Buffer | string) => Buffer.from(buf).toString("base64url");

function mac(secret: string, purpose: TokenPurpose, body: string): Buffer {
  return createHmac("sha256", secret).update(`tidewire-subscription.${purpose}.${body}`).digest();
}

export function signToken(secret: string, purpose: TokenPurpose, subscriptionId: number, nowMs = Date.now()): string {
  const body = b64(JSON.stringify({ s: subscriptionId, e: Math.floor((nowMs + TOKEN_TTL_MS[purpose]) / 1000) } satisfies Payload));
  return `${body}.${mac(secret, purpose, body).toString("base64url")}`;
}

export type TokenCheck = { ok: true; subscriptionId: number; expiresAt: Date } | { ok: false; reason: "malformed" | "bad_signature" | "expired" };

/** The one message shown for every bad token (forged, expired, for another purpose). */
export const BAD_TOKEN_MESSAGE = "This link is not valid or has expired. Links in our e-mails work for a limited time; subscribe again or use the link in a newer message.";

export function verifyToken(secret: string, purpose: TokenPurpose, token: string | null | undefined, nowMs = Date.now()): TokenCheck {
  if (!token || token.length > 400 || !/^[A-Za-z0-9_-]+\.[A-Za-z0-9_-]+$/.test(token)) return { ok: false, reason: "malformed" };
  const [body, sig] = token.split(".");
  const expected = mac(secret, purpose, body);
  const given = Buffer.from(sig, "base64url");
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return { ok: false, reason: "bad_signature" };
  let payload: Payload;
  try {
    payload = JSON.parse(Buffer.from(body, "base64url").toString("utf8")) as Payload;
  } catch {
    return { ok: false, reason: "malformed" };
  }
  if (!Number.isInteger(payload.s) || payload.s <= 0 || !Number.isFinite(payload.e)) return { ok: false, reason: "malformed" };
  if (payload.e * 1000 <= nowMs) return { ok: false, reason: "expired" };
  return { ok: true, subscriptionId: payload.s, expiresAt: new Date(payload.e * 1000) };
}
