// scripts/serve.ts admits at most MAX_IN_FLIGHT (default 8) requests into the app at once, in
// arrival order. A slot must never be held by a client: small bodies are read before admission
// and large ones bypass the queue, so clients that trickle their bodies cannot stall everyone.
import { connect, type Socket } from "node:net";
import { afterAll, describe, expect, it } from "vitest";
import { request } from "../../scripts/quality/http";

const base = () => new URL(process.env.QUALITY_BASE_URL!);
const open: Socket[] = [];
afterAll(() => {
  for (const s of open) s.destroy();
});

/** A POST whose headers announce a body that is sent one byte at a time, very slowly. */
function trickle(path: string, contentLength: number): Socket {
  const s = connect(Number(base().port), base().hostname);
  s.on("error", () => undefined);
  s.write(
    `POST ${path} HTTP/1.1\r\nHost: ${base().host}\r\nOrigin: ${base().origin}\r\nContent-Type: application/json\r\nContent-Length: ${contentLength}\r\n\r\n{`,
  );
  const timer = setInterval(() => s.write(" "), 2_000);
  s.on("close", () => clearInterval(timer));
  open.push(s);
  return s;
}

describe("fair admission", () => {
  it("twelve clients trickling small bodies (more than the 8 slots) do not stop other requests", async () => {
    const slow = Array.from({ length: 12 }, () => trickle("/api/v1/assessments", 10_000));
    await new Promise((r) => setTimeout(r, 500)); // all of them are connected and waiting
    const answers = await Promise.all([request(base().origin, "/healthz"), request(base().origin, "/"), request(base().origin, "/api/v1/convert?from=EPSG%3A4230&to=EPSG%3A4326&position=55-12.30N+003-01.10E")]);
    expect(answers.map((a) => a.status)).toEqual([200, 200, 200]);
    // The slow ones are still open: nothing above waited for them to finish.
    expect(slow.every((s) => !s.destroyed)).toBe(true);
  });

  it("clients trickling large bodies (uploads bypass the queue) do not stop other requests", async () => {
    for (let i = 0; i < 10; i++) trickle("/api/v1/assessments", 5_000_000);
    await new Promise((r) => setTimeout(r, 500));
    const r = await request(base().origin, "/healthz");
    expect(r.status).toBe(200);
  });
});
