import type { Transporter } from "nodemailer";
import { claimBatch, markFailedAttempt, markSent, type OutboxRow } from "~/models/outbox.server";
import { sendWithDeadline } from "./transport";
import { env } from "~/env.server";

export const BATCH_SIZE = 20;

export type OutboxOptions = {
  batchSize?: number;
  leaseMs?: number;
  backoffBaseMs?: number;
  backoffMaxMs?: number;
  /** Only mail of this priority or more urgent (see priorityOf in the outbox model). */
  maxPriority?: number;
  transport?: Transporter;
};

/** A stable Message-ID from the idempotency key: a copy re-sent after a crash has the same id. */
export function messageIdFor(idempotencyKey: string): string {
  return `<${idempotencyKey.replace(/[^A-Za-z0-9._-]/g, ".")}@tidewire.outbox>`;
}

async function deliver(row: OutboxRow, transport?: Transporter) {
  const headers = JSON.parse(row.headers || "{}") as Record<string, string>;
  await sendWithDeadline({
    from: env().MAIL_FROM,
    to: row.to_address,
    subject: row.subject,
    text: row.body_text,
    html: row.body_html ?? undefined,
    headers,
    messageId: messageIdFor(row.idempotency_key),
    // base64 costs a fraction of quoted-printable to encode (digests are large and many).
    textEncoding: "base64",
  }, transport);
}

/**
 * One claim-and-send cycle; returns how many messages were attempted. Each message is marked
 * sent the moment the SMTP server accepts it, so a worker killed mid-batch leaves only the
 * unaccepted ones to be retried (after their lease runs out).
 */
export async function runOutboxOnce(workerId: string, opts: OutboxOptions = {}): Promise<number> {
  const rows = await claimBatch(opts.batchSize ?? BATCH_SIZE, workerId, undefined, { leaseMs: opts.leaseMs, maxPriority: opts.maxPriority });
  const transport = opts.transport;
  await Promise.all(
    rows.map(async (row) => {
      try {
        await deliver(row, transport);
      } catch (error) {
        await markFailedAttempt(row, (error as Error).message ?? String(error), undefined, { baseMs: opts.backoffBaseMs, maxMs: opts.backoffMaxMs });
        return;
      }
      await markSent(row.id, undefined, workerId);
    }),
  );
  return rows.length;
}
