// The outbox worker SIGKILLed in the middle of a batch: after its lease runs out another worker
// takes over, and every message is delivered — none lost, none sent twice.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { until } from "../../scripts/quality/loadgen";
import { startStack, type Stack } from "../../scripts/quality/stack";
import { readMessages } from "../../fakes/smtp";

let stack: Stack;
beforeAll(async () => {
  stack = await startStack({ seed: false, worker: false, durable: true });
});
afterAll(async () => {
  await stack?.stop();
});

const TOTAL = 400;

describe("worker killed mid-batch", () => {
  it("loses nothing after a crash; only in-flight rows may repeat, with the same Message-ID", async () => {
    const tag = `kill-${Date.now()}`;
    const rows = Array.from({ length: TOTAL }, (_, i) => ({
      idempotency_key: `${tag}:${i}`,
      kind: "quality",
      to_address: `${tag}-${i}@quality.example`,
      subject: `Outbox crash test ${i}`,
      body_text: `Message ${i}`,
      headers: "{}",
      status: "queued",
      run_at: new Date(Date.now() - 1000),
    }));
    for (let i = 0; i < rows.length; i += 200) await stack.db("outbox").insert(rows.slice(i, i + 200));
    const counts = async () => {
      const r = (await stack.db("outbox").where("idempotency_key", "like", `${tag}:%`).groupBy("status").select("status").count({ n: "*" })) as Array<{ status: string; n: number }>;
      return Object.fromEntries(r.map((x) => [x.status, Number(x.n)])) as Record<string, number>;
    };

    const first = stack.startWorker();
    // Kill it once some messages are out and others are not: in the middle of the work.
    await until("the worker half-way", async () => {
      const c = await counts();
      return (c.sent ?? 0) >= 20 && (c.sending ?? 0) > 0 && (c.sent ?? 0) < TOTAL - 40;
    }, 60_000, 2);
    first.proc.kill("SIGKILL");
    await first.exited;
    const atKill = await counts();
    console.log(`[faults] worker killed with ${JSON.stringify(atKill)}`);
    expect(atKill.sent ?? 0).toBeLessThan(TOTAL);
    // A batch was claimed and not finished: the case this test is about.
    expect(atKill.sending ?? 0, "killed between batches; the case was not exercised").toBeGreaterThan(0);

    // The dead worker's claims hold a 2-minute lease (CLAIM_LEASE_MS); let it run out now rather
    // than wait, as if the time had passed.
    await stack.db("outbox").where("idempotency_key", "like", `${tag}:%`).where({ status: "sending" }).update({ locked_until: new Date(Date.now() - 1000) });
    const second = stack.startWorker();
    await until("every message sent", async () => (await counts()).sent === TOTAL, 120_000, 200);
    second.proc.kill("SIGTERM");
    await second.exited;

    const mail = readMessages(stack.mailDir).filter((m) => m.subject.startsWith("Outbox crash test"));
    const received = new Set(mail.flatMap((m) => m.recipients));
    const lost = rows.map((r) => r.to_address).filter((a) => !received.has(a));
    expect(lost, "lost").toEqual([]);
    // SMTP has no transaction with our database: a kill after the relay accepted a message and
    // before the row was marked sent makes the next worker send it again. What the outbox can
    // promise is that such a copy is the same message (same Message-ID, derived from the
    // idempotency key, so receivers drop it) and only for rows that were in flight at the kill.
    // Any other duplicate is a bug.
    const messageId = (m: (typeof mail)[number]) => m.headerLines.find((h) => h.key === "message-id")?.line.replace(/^message-id:\s*/i, "").trim() ?? "";
    const copies = new Map<string, { n: number; ids: Set<string> }>();
    for (const m of mail) for (const r of m.recipients) {
      const c = copies.get(r) ?? { n: 0, ids: new Set<string>() };
      c.n += 1;
      c.ids.add(messageId(m));
      copies.set(r, c);
    }
    const twice = [...copies].filter(([, c]) => c.n > 1);
    const differentIds = twice.filter(([, c]) => c.ids.size > 1 || c.ids.has("")).map(([a]) => a);
    expect(differentIds, "a re-sent copy must carry the same Message-ID").toEqual([]);
    expect(twice.length, `re-sent copies (killed with ${JSON.stringify(atKill)}): only rows in flight may repeat`).toBeLessThanOrEqual(atKill.sending ?? 0);
    if (twice.length) console.log(`[faults] ${twice.length} message(s) in flight at the kill were re-sent with the same Message-ID`);
  }, 240_000);
});
