import type { Knex } from "knex";

export type NoticeEventKind = "published" | "amended" | "cancelled" | "expired";

/**
 * Called by the notices model inside the transaction that changes a notice, so anything that
 * follows from the change (alerts queued in the outbox) commits or rolls back with it.
 * The subscriptions feature fills this in.
 */
export async function onNoticeEvent(_trx: Knex.Transaction, _event: { kind: NoticeEventKind; noticeId: number }): Promise<void> {}
