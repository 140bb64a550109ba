import { claimBatch, markFailedAttempt, markSent, type OutboxRow } from "~/models/outbox.server";
import { mailTransport } from "~/services/mail.server";
import { env } from "~/env.server";

export const BATCH_SIZE = 20;

async function deliver(row: OutboxRow) {
  const headers = JSON.parse(row.headers || "{}") as Record<string, string>;
  await mailTransport().sendMail({
    from: env().MAIL_FROM,
    to: row.to_address,
    subject: row.subject,
    text: row.body_text,
    html: row.body_html ?? undefined,
    headers,
    // A stable Message-ID lets receiving systems drop a copy re-sent after a crash.
    messageId: `<${row.idempotency_key.replace(/[^A-Za-z0-9._-]/g, ".")}@tidewire.outbox>`,
  });
}

/** One claim-and-send cycle; returns how many messages were attempted. */
export async function runOutboxOnce(workerId: string): Promise<number> {
  const rows = await claimBatch(BATCH_SIZE, workerId);
  await Promise.all(
    rows.map(async (row) => {
      try {
        await deliver(row);
        await markSent(row.id);
      } catch (error) {
        await markFailedAttempt(row, (error as Error).message ?? String(error));
      }
    }),
  );
  return rows.length;
}
