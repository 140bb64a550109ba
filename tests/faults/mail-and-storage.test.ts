// The SMTP relay down: mail waits in the outbox and all of it is delivered, once each, after it
// returns. The S3 store down: a report with a photo fails cleanly (503, a message, the typed text
// sent back in the form) and stores nothing; the same report goes through once S3 is back.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { request } from "../../scripts/quality/http";
import { until } from "../../scripts/quality/loadgen";
import { createAccount } from "../../scripts/quality/people";
import { startStack, type Stack } from "../../scripts/quality/stack";
import { readMessages } from "../../fakes/smtp";
import { jpegWithGps } from "../support/images";

let stack: Stack;
beforeAll(async () => {
  stack = await startStack({ seed: true, worker: true, durable: true });
});
afterAll(async () => {
  await stack?.stop();
});

describe("SMTP relay outage", () => {
  it("mail waits in the outbox and is all delivered, once each, after the relay returns", async () => {
    await stack.smtp.stopSmtp();
    const people = await Promise.all(Array.from({ length: 8 }, () => createAccount(stack.db, "boater")));
    for (const p of people) {
      const r = await request(stack.baseURL, "/forgot-password", { form: { email: p.email } });
      expect(r.status, "the page does not depend on the relay").toBe(302);
    }
    const emails = people.map((p) => p.email);
    const rows = () => stack.db("outbox").whereIn("to_address", emails).select("status", "attempts", "last_error", "to_address");
    // The worker tried, failed, and kept every message queued for a retry.
    await until("a failed attempt on every message", async () => (await rows()).length === emails.length && (await rows()).every((r) => r.attempts >= 1 && r.status === "queued" && r.last_error), 30_000, 200);
    expect(readMessages(stack.mailDir).filter((m) => m.recipients.some((x) => emails.includes(x)))).toEqual([]);

    await stack.smtp.startSmtp();
    // Retried after the worker's backoff (15 s after the first failure): no restart needed.
    await until("every message sent", async () => (await rows()).every((r) => r.status === "sent"), 120_000, 500);
    const got = readMessages(stack.mailDir).filter((m) => m.recipients.some((x) => emails.includes(x)));
    const perRecipient = new Map<string, number>();
    for (const m of got) for (const r of m.recipients) perRecipient.set(r, (perRecipient.get(r) ?? 0) + 1);
    expect(Object.fromEntries(perRecipient)).toEqual(Object.fromEntries(emails.map((e) => [e, 1])));
    for (const m of got) expect(m.subject).toContain("Reset your Tidewire password");
  }, 180_000);
});

describe("S3 store outage", () => {
  it("a report with a photo fails cleanly with the text kept, stores nothing, and succeeds after", async () => {
    const page = await request(stack.baseURL, "/report");
    expect(page.status).toBe(200);
    const aid = (await stack.db("aids").orderBy("id").first("id", "code")) as { id: number; code: string };
    const remarks = `Topmark missing, light seen flashing irregularly — fault test ${Date.now()}`;
    const form = () => {
      const fd = new FormData();
      const fields: Record<string, string> = {
        target: "aid",
        aidId: String(aid.id),
        method: "gnss",
        "gnss.position": "55°12.31′N 003°02.11′E",
        observedAt: "2026-11-30T09:15",
        remarks,
        reporterEmail: "faults@boaters.example",
        reporterName: "Fault Tester",
        reporterVessel: "Kittiwake",
      };
      for (const [k, v] of Object.entries(fields)) fd.append(k, v);
      return fd;
    };
    const photo = await jpegWithGps({ lat: 55.205, lon: 3.035 });
    const reportsBefore = Number((await stack.db("reports").count({ n: "*" }).first())!.n);
    const photosBefore = Number((await stack.db("report_photos").count({ n: "*" }).first())!.n);

    await stack.stopS3();
    const fd = form();
    fd.append("photos", new Blob([new Uint8Array(photo)], { type: "image/jpeg" }), "buoy.jpg");
    const down = await request(stack.baseURL, "/report", { method: "POST", body: fd });
    expect(down.status).toBe(503);
    expect(down.text).toMatch(/role="alert"/);
    // The typed text comes back in the form, so nothing has to be typed again.
    expect(down.text).toContain(remarks.replace(/—/g, "—"));
    expect(down.text).toContain("Kittiwake");
    expect(Number((await stack.db("reports").count({ n: "*" }).first())!.n)).toBe(reportsBefore);
    expect(Number((await stack.db("report_photos").count({ n: "*" }).first())!.n)).toBe(photosBefore);

    await stack.startS3();
    const fd2 = form();
    fd2.append("photos", new Blob([new Uint8Array(photo)], { type: "image/jpeg" }), "buoy.jpg");
    const up = await request(stack.baseURL, "/report", { method: "POST", body: fd2 });
    expect(up.status, up.text.slice(0, 500)).toBe(302);
    const stored = await stack.db("reports").where({ remarks }).first();
    expect(stored).toBeTruthy();
    expect(Number((await stack.db("report_photos").where({ report_id: stored.id }).count({ n: "*" }).first())!.n)).toBe(1);
  }, 120_000);
});
