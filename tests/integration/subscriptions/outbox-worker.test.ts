// The outbox worker as a real child process (`tsx app/worker/main.ts`) against the real test
// database and SMTP sinks on real sockets: crash and restart, relay outage, two workers.
import { afterAll, describe, expect, it } from "vitest";
import { db } from "~/db.server";
import { claimBatch, enqueueMail } from "~/models/outbox.server";
import { messageIdFor } from "~/worker/outbox";
import { startSmtpFake } from "../../../fakes/smtp";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { startGateSmtp, startWorker, stopWorker, tag, until } from "./fixtures";

afterAll(async () => {
  await db.destroy();
});

async function queue(prefix: string, n: number): Promise<string[]> {
  const keys: string[] = [];
  await db.transaction(async (trx) => {
    for (let i = 0; i < n; i++) {
      const key = `${prefix}:${i}`;
      keys.push(key);
      await enqueueMail({ idempotencyKey: key, kind: "test", to: `${prefix.replace(/[^a-z0-9]/gi, "")}-${i}@worker.test`, subject: `Test ${i}`, text: `Message ${i}` }, trx);
    }
  });
  return keys;
}

const statusCounts = async (prefix: string) => {
  const rows = await db("outbox").select("status").count({ n: "*" }).where("idempotency_key", "like", `${prefix}:%`).groupBy("status");
  return Object.fromEntries(rows.map((r: any) => [r.status, Number(r.n)])) as Record<string, number>;
};

function countBy(ids: string[]): Map<string, number> {
  const m = new Map<string, number>();
  for (const id of ids) m.set(id, (m.get(id) ?? 0) + 1);
  return m;
}

describe("outbox worker", () => {
  it("killed mid-batch and restarted, sends every message exactly once", { timeout: 90_000 }, async () => {
    const prefix = `kill-${tag()}`;
    const keys = await queue(prefix, 60);
    const expected = keys.map(messageIdFor);
    // The sink accepts 25 messages, then stops answering: the worker is waiting on SMTP.
    const gate = await startGateSmtp({ holdAfter: 25 });
    const env = { SMTP_PORT: String(gate.port), OUTBOX_LEASE_MS: "1500", OUTBOX_BATCH_SIZE: "20" };
    const first = startWorker(env);
    await until("the worker to be stuck on held messages with every accepted one recorded", async () => {
      if (gate.held() === 0) return false;
      const c = await statusCounts(prefix);
      return (c.sent ?? 0) === gate.accepted.filter((id) => expected.includes(id)).length;
    });
    const acceptedBeforeKill = gate.accepted.length;
    await stopWorker(first, "SIGKILL");
    expect(acceptedBeforeKill).toBeGreaterThanOrEqual(25);
    expect((await statusCounts(prefix)).sending).toBeGreaterThan(0); // claimed, not sent: leases pending

    // Release only once the sink has seen the killed worker's connections close: a held message
    // released on a connection the sink still thinks is open would be accepted after all (and
    // then sent again by the next worker). On a loaded machine the close can take a moment.
    await until("the killed worker's connections to close", async () => gate.held() === 0);
    gate.release(); // the killed worker's connections are gone: their held messages were never accepted
    const second = startWorker(env);
    try {
      await until("all 60 sent", async () => (await statusCounts(prefix)).sent === 60);
    } finally {
      await stopWorker(second);
    }
    await gate.stop();
    const counts = countBy(gate.accepted.filter((id) => expected.includes(id)));
    expect(counts.size).toBe(60);
    expect([...counts.values()].every((n) => n === 1)).toBe(true);
  });

  it("waits with backoff while SMTP is down and delivers everything once it is back", { timeout: 90_000 }, async () => {
    const prefix = `outage-${tag()}`;
    const fake = await startSmtpFake({ smtpPort: 0, httpPort: 0, dir: mkdtempSync(join(tmpdir(), "tidewire-outage-")) });
    await fake.stopSmtp();
    const keys = await queue(prefix, 15);
    const worker = startWorker({ SMTP_PORT: String(fake.smtpPort), OUTBOX_BACKOFF_BASE_MS: "100", OUTBOX_BACKOFF_MAX_MS: "400" });
    try {
      await until("every message tried at least twice", async () => {
        const rows = await db("outbox").where("idempotency_key", "like", `${prefix}:%`).select("attempts", "status", "last_error");
        return rows.length === 15 && rows.every((r: any) => r.attempts >= 2 && r.status !== "sent");
      }, 20_000).catch(async (e) => {
        console.log(worker.output(), await db("outbox").where("idempotency_key", "like", `${prefix}:%`).select("attempts", "status", "last_error", "run_at"));
        throw e;
      });
      const waiting = await db("outbox").where("idempotency_key", "like", `${prefix}:%`).select("status", "last_error");
      expect(waiting.every((r: any) => r.status !== "failed")).toBe(true); // waiting, not given up
      expect(waiting.some((r: any) => /ECONNREFUSED|connect/i.test(r.last_error ?? ""))).toBe(true);
      expect(fake.messages()).toHaveLength(0);

      await fake.startSmtp();
      await until("all 15 sent after the relay is back", async () => (await statusCounts(prefix)).sent === 15, 20_000).catch(async (e) => {
        console.log(worker.output().slice(-3000), await statusCounts(prefix), await db("outbox").whereNot({ status: "sent" }).select("idempotency_key", "status", "attempts", "run_at", "locked_until", "last_error").limit(5));
        throw e;
      });
    } finally {
      await stopWorker(worker);
    }
    const ids = fake.messages().map((m) => m.headerLines.find((h) => h.key === "message-id")!.line.replace(/^Message-ID:\s*/i, ""));
    const counts = countBy(ids);
    expect(counts.size).toBe(15);
    expect([...counts.keys()].sort()).toEqual(keys.map(messageIdFor).sort());
    expect([...counts.values()].every((n) => n === 1)).toBe(true);
    await fake.stop();
  });

  it("two workers at once send no message twice", { timeout: 90_000 }, async () => {
    const prefix = `two-${tag()}`;
    const fake = await startSmtpFake({ smtpPort: 0, httpPort: 0, dir: mkdtempSync(join(tmpdir(), "tidewire-two-")) });
    const keys = await queue(prefix, 200);
    const env = { SMTP_PORT: String(fake.smtpPort), OUTBOX_BATCH_SIZE: "10" };
    const a = startWorker(env);
    const b = startWorker(env);
    try {
      await until("all 200 sent", async () => (await statusCounts(prefix)).sent === 200, 60_000);
    } finally {
      await Promise.all([stopWorker(a), stopWorker(b)]);
    }
    const ids = fake.messages().map((m) => m.headerLines.find((h) => h.key === "message-id")!.line.replace(/^Message-ID:\s*/i, ""));
    const counts = countBy(ids);
    expect(counts.size).toBe(200);
    expect([...counts.values()].every((n) => n === 1)).toBe(true);
    expect([...counts.keys()].sort()).toEqual(keys.map(messageIdFor).sort());
    const split = await db("outbox").where("idempotency_key", "like", `${prefix}:%`).select("locked_by").count({ n: "*" }).groupBy("locked_by");
    console.log(`[two workers] messages per worker: ${split.map((s: any) => s.n).join(" / ")}`);
    await fake.stop();
  });

  it("claims an alert queued after thousands of digests before them", async () => {
    const prefix = `prio-${tag()}`;
    await db.transaction(async (trx) => {
      for (let i = 0; i < 30; i++) await enqueueMail({ idempotencyKey: `${prefix}:digest:${i}`, kind: "digest", to: `d${i}@prio.test`, subject: "Digest", text: "d" }, trx);
    });
    await enqueueMail({ idempotencyKey: `${prefix}:alert`, kind: "alert", to: "a@prio.test", subject: "Alert", text: "a" });
    const claimed = await claimBatch(1, "prio-test");
    try {
      expect(claimed).toHaveLength(1);
      expect((claimed[0] as { priority?: number }).priority).toBe(1);
      expect(claimed[0].idempotency_key).not.toMatch(/:digest:/);
    } finally {
      await db("outbox").whereIn("id", claimed.map((r) => r.id)).update({ status: "queued", locked_until: null });
      await db("outbox").where("idempotency_key", "like", `${prefix}:%`).delete();
    }
  });
});
