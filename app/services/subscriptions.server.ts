// Subscription flows used by the routes: request (double opt-in), confirm, change, end.
import { db } from "~/db.server";
import { env } from "~/env.server";
import type { SubscriptionFormData } from "~/lib/subscriptions/form";
import { BAD_TOKEN_MESSAGE, verifyToken, type TokenPurpose } from "~/lib/subscriptions/tokens";
import { enqueueMail } from "~/models/outbox.server";
import {
  confirmSubscription,
  createConfirmedSubscription,
  createPendingSubscription,
  endSubscription,
  getHarbourForMail,
  getSubscription,
  updateSubscription,
  type HarbourForMail,
  type Subscription,
} from "~/models/subscription.server";
import { confirmationMail } from "./subscription-mail.server";

/** At most this many unconfirmed requests per address per day get a confirmation mail. */
export const MAX_PENDING_PER_ADDRESS_PER_DAY = 5;

export async function defaultHarbour(): Promise<HarbourForMail> {
  const h = await getHarbourForMail();
  if (!h) throw new Response("No harbour is set up yet.", { status: 503 });
  return h;
}

/**
 * A subscription request. The answer is the same whether or not the address is already
 * subscribed: a confirmation mail goes to the address, and only its owner can confirm. A
 * signed-in boater subscribing their own verified address needs no confirmation mail.
 */
export async function requestSubscription(data: SubscriptionFormData, harbour: HarbourForMail, user: { id: number; email: string } | null): Promise<"confirmed" | "mailed"> {
  return db.transaction(async (trx) => {
    const input = { ...data, harbourId: harbour.id, userId: user?.id ?? null };
    if (user && user.email.toLowerCase() === data.email) {
      await createConfirmedSubscription(input, harbour, new Date(), trx);
      return "confirmed" as const;
    }
    const [{ n }] = await trx("subscriptions").where({ email: data.email, status: "pending" }).where("created_at", ">", new Date(Date.now() - 24 * 3600_000)).count({ n: "*" });
    if (Number(n) >= MAX_PENDING_PER_ADDRESS_PER_DAY) return "mailed" as const; // quietly: no mail flood to a victim's address
    const id = await createPendingSubscription(input, harbour, trx);
    const sub = (await getSubscription(id, trx))!;
    const mail = confirmationMail(sub, harbour);
    await enqueueMail({ idempotencyKey: `subscription-confirm:${id}`, kind: "subscription", to: data.email, ...mail }, trx);
    return "mailed" as const;
  });
}

export type TokenLookup = { ok: true; subscription: Subscription } | { ok: false; message: string };

/** A token's subscription, or the one message for any bad token (forged, expired, ended). */
export async function subscriptionFromToken(purpose: TokenPurpose, token: string | null, opts: { allowEnded?: boolean } = {}): Promise<TokenLookup> {
  const check = verifyToken(env().SESSION_SECRET, purpose, token);
  if (!check.ok) return { ok: false, message: BAD_TOKEN_MESSAGE };
  const sub = await getSubscription(check.subscriptionId);
  if (!sub || (sub.status === "ended" && !opts.allowEnded)) return { ok: false, message: BAD_TOKEN_MESSAGE };
  return { ok: true, subscription: sub };
}

export async function confirmFromToken(token: string | null): Promise<TokenLookup> {
  const found = await subscriptionFromToken("confirm", token);
  if (!found.ok) return found;
  const harbour = (await getHarbourForMail(found.subscription.harbourId))!;
  const ok = await confirmSubscription(found.subscription.id, harbour.timeZone);
  if (!ok) return { ok: false, message: BAD_TOKEN_MESSAGE };
  return { ok: true, subscription: (await getSubscription(found.subscription.id))! };
}

export async function changeSubscription(sub: Subscription, data: Omit<SubscriptionFormData, "email">): Promise<boolean> {
  const harbour = (await getHarbourForMail(sub.harbourId))!;
  return updateSubscription(sub.id, data, harbour);
}

export async function unsubscribe(sub: Subscription): Promise<void> {
  await endSubscription(sub.id, "unsubscribed");
}

/** Form values to refill the subscribe / manage form from a stored subscription. */
export function formValuesOf(sub: Subscription) {
  return {
    email: sub.email,
    areaKind: sub.area.kind,
    centre: sub.area.kind === "circle" ? (sub.areaText ?? "") : "",
    radiusNm: sub.area.kind === "circle" ? String(sub.area.radiusNm) : "",
    polygon: sub.area.kind === "polygon" ? (sub.areaText ?? "") : "",
    generalTypes: sub.generalTypes,
    urgentAlerts: sub.urgentAlerts,
    digestCadence: sub.digest.cadence,
    digestLocalTime: sub.digest.localTime ?? "07:00",
    digestWeekday: String(sub.digest.weekday ?? 1),
  };
}
