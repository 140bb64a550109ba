import type { Knex } from "knex";
import { enqueueMails } from "~/models/outbox.server";
import { closeReportsForNotice } from "~/models/report.server";
import { findAlertRecipients, getHarbourForMail, loadNoticesForMail } from "~/models/subscription.server";
import { alertMail } from "./subscription-mail.server";

export type NoticeEventKind = "published" | "amended" | "cancelled" | "expired";

/** Kinds that send an immediate alert for an urgent notice (expiry only shows in digests). */
const ALERT_KINDS = new Set<NoticeEventKind>(["published", "amended", "cancelled"]);

/**
 * Called by the notices model inside the transaction that changes a notice, so anything that
 * follows from the change commits or rolls back with it: the change is logged for digests and,
 * for urgent notices, one alert per matching confirmed subscription is queued in the outbox.
 * The idempotency key `alert:<subscription>:<notice>:<kind>:<version>` makes a repeated call
 * for the same change queue nothing new.
 */
export async function onNoticeEvent(trx: Knex.Transaction, event: { kind: NoticeEventKind; noticeId: number }): Promise<{ alerts: number }> {
  const notice = (await loadNoticesForMail([event.noticeId], trx)).get(event.noticeId);
  if (!notice) throw new Error(`onNoticeEvent: notice ${event.noticeId} not found`);
  // The change's own time (the notices model sets updated_at to it), so digests follow it.
  await trx("notice_changes").insert({ notice_id: notice.id, kind: event.kind, version: notice.version, occurred_at: notice.updatedAt ?? new Date() });
  // Discrepancy reports linked to the notice close with its publication (reports feature).
  if (event.kind === "published") await closeReportsForNotice(event.noticeId, null, trx);
  if (notice.urgency !== "urgent" || !ALERT_KINDS.has(event.kind)) return { alerts: 0 };
  const harbour = await getHarbourForMail(notice.harbourId, trx);
  if (!harbour) return { alerts: 0 };
  const recipients = await findAlertRecipients(notice, trx);
  // Multi-row inserts: a harbour-wide urgent notice may concern thousands of subscribers, and
  // this runs inside the publishing transaction.
  await enqueueMails(
    recipients.map((sub) => ({
      idempotencyKey: `alert:${sub.id}:${notice.id}:${event.kind}:${notice.version}`,
      kind: "alert",
      to: sub.email,
      ...alertMail(sub, harbour, notice, event.kind as "published" | "amended" | "cancelled"),
    })),
    trx,
  );
  return { alerts: recipients.length };
}
