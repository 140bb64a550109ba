// Set-up for the subscription tests: a harbour of their own, staff to publish notices, confirmed
// subscriptions, worker child processes and an SMTP sink that can hold messages unanswered.
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import type { AddressInfo } from "node:net";
import { join } from "node:path";
import { SMTPServer } from "smtp-server";
import { db } from "~/db.server";
import type { SubscriptionArea } from "~/lib/subscriptions/area";
import type { DigestSchedule } from "~/lib/subscriptions/schedule";
import { createDraft, publishNotice } from "~/models/notice.server";
import { createConfirmedSubscription, getHarbourForMail, type HarbourForMail } from "~/models/subscription.server";
import { makeHarbour, makeStaff, noticeInput } from "../notices-fixtures";

export { makeHarbour, makeStaff, noticeInput };

export const tag = () => randomBytes(4).toString("hex");

export async function harbourForMail(id: number): Promise<HarbourForMail> {
  return (await getHarbourForMail(id))!;
}

export async function subscribe(
  harbour: HarbourForMail,
  email: string,
  area: SubscriptionArea,
  opts: { types?: string[]; urgentAlerts?: boolean; digest?: DigestSchedule; status?: "pending" | "ended"; confirmedAt?: Date } = {},
): Promise<number> {
  const id = await createConfirmedSubscription(
    { email, harbourId: harbour.id, area, generalTypes: opts.types ?? [], urgentAlerts: opts.urgentAlerts ?? true, digest: opts.digest ?? { cadence: "none", localTime: null, weekday: null } },
    harbour,
    opts.confirmedAt ?? new Date(),
  );
  if (opts.status) await db("subscriptions").where({ id }).update({ status: opts.status });
  return id;
}

/** Draft and publish a notice through the notices model (the real publishing path). */
export async function publish(harbourId: number, harbourmaster: { id: number }, overrides: Record<string, string | string[]>, at = new Date()) {
  const draft = await createDraft(harbourId, noticeInput(overrides), { id: harbourmaster.id, role: "officer" }, { at });
  return publishNotice(draft.id, draft.version, { id: harbourmaster.id, role: "harbourmaster" }, { at, acceptOutside: true });
}

/** A point notice part as the notice form takes it (WGS 84). */
export const pointPart = (position: string) => ({ "parts.0.kind": "point", "parts.0.crs": "EPSG:4326", "parts.0.positions": position });

// ---------------------------------------------------------------------------------------------
// Worker processes

export type WorkerProcess = { child: ChildProcess; output: () => string; exited: Promise<number | null> };

export function startWorker(env: Record<string, string>): WorkerProcess {
  const root = join(import.meta.dirname, "../../..");
  // node --import tsx, not the tsx wrapper: the wrapper runs the script in a child process that a
  // SIGKILL of the wrapper would leave running.
  const child = spawn(process.execPath, ["--import", "tsx", "app/worker/main.ts"], {
    cwd: root,
    env: { ...process.env, NODE_ENV: "test", WORKER_JOBS: "outbox", WORKER_POLL_MS: "50", ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let out = "";
  child.stdout!.on("data", (d) => (out += d));
  child.stderr!.on("data", (d) => (out += d));
  const exited = new Promise<number | null>((r) => child.on("exit", (code) => r(code)));
  return { child, output: () => out, exited };
}

export async function stopWorker(w: WorkerProcess, signal: NodeJS.Signals = "SIGTERM") {
  if (w.child.exitCode === null && w.child.signalCode === null) w.child.kill(signal);
  await w.exited;
}

/** Polls `check` until it returns a truthy value; fails with `what` after `timeoutMs`. */
export async function until<T>(what: string, check: () => Promise<T> | T, timeoutMs = 30_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await check();
    if (v) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for: ${what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

// ---------------------------------------------------------------------------------------------
// An SMTP sink that can stop answering: in "hold" mode it keeps each message's final reply back,
// so the client is still waiting when it is killed. A held message whose connection closes was
// never accepted (the client never heard 250) and is dropped, as a real relay would.

export type GateSmtp = {
  port: number;
  /** Message-IDs accepted (250 sent), in order, duplicates included. */
  accepted: string[];
  held: () => number;
  hold(): void;
  /** Accept from now on, and answer held messages whose client is still connected. */
  release(): void;
  stop(): Promise<void>;
};

export async function startGateSmtp(opts: { holdAfter?: number } = {}): Promise<GateSmtp> {
  const accepted: string[] = [];
  let holding = false;
  const closed = new Set<string>();
  let held: { sessionId: string; messageId: string; cb: (err?: Error | null) => void }[] = [];
  const server = new SMTPServer({
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    closeTimeout: 100,
    onClose(session) {
      closed.add(session.id);
      held = held.filter((h) => h.sessionId !== session.id);
    },
    onData(stream, session, cb) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", () => {
        const raw = Buffer.concat(chunks).toString("utf8");
        const messageId = /^Message-ID:\s*(<[^>]+>)/im.exec(raw)?.[1] ?? "(none)";
        if (opts.holdAfter !== undefined && accepted.length >= opts.holdAfter) holding = true;
        if (holding) held.push({ sessionId: session.id, messageId, cb });
        else {
          accepted.push(messageId);
          cb();
        }
      });
    },
  });
  // A client killed mid-transaction resets its connection: expected here, not an error.
  server.on("error", () => {});
  await new Promise<void>((r) => server.listen(0, "127.0.0.1", () => r()));
  const port = (server.server.address() as AddressInfo).port;
  return {
    port,
    accepted,
    held: () => held.length,
    hold: () => {
      holding = true;
    },
    release: () => {
      holding = false;
      opts.holdAfter = undefined;
      for (const h of held.splice(0)) {
        if (closed.has(h.sessionId)) continue;
        accepted.push(h.messageId);
        h.cb();
      }
    },
    stop: () => new Promise<void>((r) => server.close(() => r())),
  };
}
