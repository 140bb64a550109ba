// MariaDB SIGKILLed and started again while the app is under load. While it is down, pages get
// the 503 page (HTML) and the API a JSON 503, both with Retry-After, and never a 500 or a dropped
// connection; once it is back the same app processes answer normally again (no restart); and
// every write is all-or-nothing: a sign-up (account + verification token + outbox mail, one
// transaction) exists completely or not at all, and every sign-up that was answered with success
// is there after the crash.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startLoad, sleep, tally, until, type Sample } from "../../scripts/quality/loadgen";
import { request } from "../../scripts/quality/http";
import { createAccount, PASSWORD, sessionCookie } from "../../scripts/quality/people";
import { serverOutput, startStack, type Stack } from "../../scripts/quality/stack";

let stack: Stack;
beforeAll(async () => {
  stack = await startStack({ seed: true, durable: true });
});
afterAll(async () => {
  await stack?.stop();
});

let n = 0;
const signUpForm = () => {
  n += 1;
  const email = `crash-${n}-${Date.now()}@quality.example`;
  return { name: `Crash test ${n}`, email, password: PASSWORD, confirmPassword: PASSWORD };
};

describe("database outage under load", () => {
  it("503 while down, recovery without restart, no half-done write", async () => {
    const boater = await createAccount(stack.db, "boater");
    const cookie = await sessionCookie(stack.db, stack.env.SESSION_SECRET, boater.id);
    const serverPids = stack.servers.map((s) => s.proc.pid);
    const load = startLoad(stack.baseURL, [
      { name: "board", path: "/" },
      { name: "account page", path: "/account", cookie },
      { name: "notices API", path: "/api/v1/notices?bbox=-6,55,-4,57" },
      { name: "sign-up", path: "/sign-up", method: "POST", form: signUpForm },
    ]);

    // Healthy first.
    await until("answers before the outage", () => load.samples.filter((s) => s.status === 200 || s.status === 302).length > 20);
    const tKill = Date.now();
    stack.killDb();
    // Long enough for every loop to meet the outage several times (pool timeouts are 2–3 s).
    await until("503s from every target", () => ["board", "account page", "notices API", "sign-up"].every((t) => load.samples.some((s) => s.target === t && s.startedAt > tKill && s.status === 503)), 30_000);
    await sleep(1000);
    const tRestart = Date.now();
    await stack.startDb();
    const tUp = Date.now();
    // The same app processes recover by themselves.
    await until("/healthz OK again", async () => (await request(stack.baseURL, "/healthz")).status === 200, 30_000, 200);
    const tRecovered = Date.now();
    // Keep the load on until every target has answered normally a few times after recovery.
    const okAfter = (t: string) => load.samples.filter((x) => x.target === t && x.startedAt > tRecovered + 500 && (x.status === 200 || x.status === 302)).length;
    await until("every target answering again", () => ["board", "account page", "notices API", "sign-up"].every((t) => okAfter(t) >= 3), 60_000, 100);
    const samples = await load.stop();
    console.log(`[faults] db killed at +0 ms, restarted at +${tRestart - tKill} ms (up after ${tUp - tRestart} ms), app healthy at +${tRecovered - tKill} ms; ${tally(samples)}`);

    expect(stack.servers.map((s) => s.proc.pid)).toEqual(serverPids);
    expect(stack.servers.every((s) => s.proc.exitCode === null), "the app processes kept running").toBe(true);

    const describeSample = (s: Sample) => `${s.target} ${s.path} → ${s.status} ${s.contentType} ${s.error ?? (s.body.includes("<main") ? s.body.slice(s.body.indexOf("<main"), s.body.indexOf("<main") + 400) : s.body.slice(0, 200))}`;
    // Never a 500, never a dropped connection: only success, a redirect or a 503.
    const bad = samples.filter((s) => ![200, 302, 503].includes(s.status));
    expect(bad.map(describeSample), `server log:\n${serverOutput(stack.servers[0]!).split("\n").filter((l) => !/Acquire connection error|^\s+at |ECONNREFUSED/.test(l)).join("\n").slice(-3000)}`).toEqual([]);

    for (const s of samples.filter((x) => x.status === 503)) {
      expect(s.retryAfter, describeSample(s)).toBeTruthy();
      if (s.target === "notices API") {
        expect(s.contentType, describeSample(s)).toMatch(/^application\/json/);
        expect(JSON.parse(s.body), describeSample(s)).toMatchObject({ error: expect.stringMatching(/unavailable/i) });
      } else {
        expect(s.contentType, describeSample(s)).toMatch(/^text\/html/);
        expect(s.body, describeSample(s)).toContain("Temporarily unavailable");
      }
    }
    // After recovery everything answers normally again.
    const after = samples.filter((s) => s.startedAt > tRecovered + 500);
    expect(after.filter((s) => s.status === 503).map(describeSample)).toEqual([]);
    for (const t of ["board", "account page", "notices API"]) expect(after.some((s) => s.target === t && s.status === 200), t).toBe(true);

    // Writes: all-or-nothing, and every acknowledged one kept (innodb_flush_log_at_trx_commit=1).
    const attempts = samples.filter((s) => s.target === "sign-up" && s.form);
    expect(attempts.some((s) => s.status === 302)).toBe(true);
    expect(attempts.some((s) => s.status === 503)).toBe(true);
    for (const s of attempts) {
      const email = s.form!.email;
      const user = await stack.db("users").where({ email }).first();
      const tokens = user ? await stack.db("user_tokens").where({ user_id: user.id }).count({ n: "*" }).first() : { n: 0 };
      const mails = await stack.db("outbox").where({ to_address: email }).count({ n: "*" }).first();
      const parts = [!!user, Number(tokens!.n) === 1, Number(mails!.n) === 1];
      expect(parts.every(Boolean) || parts.every((p) => !p), `${email} (${s.status}): account ${parts[0]}, token ${parts[1]}, mail ${parts[2]}`).toBe(true);
      if (s.status === 302) expect(user, `${email} was acknowledged but is gone`).toBeTruthy();
    }
  }, 120_000);
});
