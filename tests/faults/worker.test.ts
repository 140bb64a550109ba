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
  it("delivers every message exactly once after a crash", async () => {
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
    const perRecipient = new Map<string, number>();
    for (const m of mail) for (const r of m.recipients) perRecipient.set(r, (perRecipient.get(r) ?? 0) + 1);
    const lost = rows.map((r) => r.to_address).filter((a) => !perRecipient.has(a));
    const twice = [...perRecipient].filter(([, n]) => n > 1).map(([a, n]) => `${a} ×${n}`);
    expect(lost, "lost").toEqual([]);
    expect(twice, `sent twice (killed with ${JSON.stringify(atKill)})`).toEqual([]);
  }, 240_000);
});
