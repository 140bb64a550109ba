// Reading mail captured by the SMTP fake in tests. The fake writes one <id>.json per message into
// TEST_MAIL_DIR (set by the test harness), so any process can read it without a connection.
import { readMessages, type CapturedMail } from "../../fakes/smtp";

export type { CapturedMail };

function mailDir(): string {
  const dir = process.env.TEST_MAIL_DIR;
  if (!dir) throw new Error("TEST_MAIL_DIR is not set: are the test services running (integration/e2e project)?");
  return dir;
}

export function allMail(): CapturedMail[] {
  return readMessages(mailDir());
}

function matches(m: CapturedMail, to: string, subject?: string | RegExp): boolean {
  const addr = to.toLowerCase();
  const toOk = m.recipients.includes(addr) || m.to.toLowerCase().includes(addr);
  if (!toOk) return false;
  if (subject === undefined) return true;
  return typeof subject === "string" ? m.subject.includes(subject) : subject.test(m.subject);
}

/**
 * The newest captured message to `to` (envelope or To header) whose subject contains `subject`
 * (or matches the RegExp). Polls until it arrives; rejects after `timeoutMs` listing what did
 * arrive, so a missing mail fails with a useful message. `after` skips messages received
 * before that moment (e.g. an earlier mail to the same address).
 */
export async function waitForMail(q: {
  to: string;
  subject?: string | RegExp;
  after?: Date;
  timeoutMs?: number;
}): Promise<CapturedMail> {
  const deadline = Date.now() + (q.timeoutMs ?? 10_000);
  for (;;) {
    const found = allMail().find(
      (m) => matches(m, q.to, q.subject) && (!q.after || new Date(m.receivedAt) >= q.after),
    );
    if (found) return found;
    if (Date.now() > deadline) {
      const seen = allMail().map((m) => `  ${m.recipients.join(",")}: ${m.subject}`).join("\n") || "  (none)";
      throw new Error(`no mail to ${q.to}${q.subject ? ` with subject ${q.subject}` : ""}; captured:\n${seen}`);
    }
    await new Promise((r) => setTimeout(r, 50));
  }
}

/** Every http(s) URL in the message's text part (then HTML part), in order. */
export function linksIn(m: CapturedMail): string[] {
  const urls = (m.text + "\n" + m.html).match(/https?:\/\/[^\s"'<>)]+/g) ?? [];
  return [...new Set(urls.map((u) => u.replace(/&amp;/g, "&")))];
}

/** The first link whose URL contains `part` (e.g. "/verify"); throws if there is none. */
export function linkIn(m: CapturedMail, part: string): string {
  const link = linksIn(m).find((u) => u.includes(part));
  if (!link) throw new Error(`no link containing ${part} in mail "${m.subject}":\n${m.text}`);
  return link;
}

async function smtpControl(action: "stop" | "start"): Promise<void> {
  const base = process.env.TEST_MAIL_INBOX_URL;
  if (!base) throw new Error("TEST_MAIL_INBOX_URL is not set: are the test services running?");
  const res = await fetch(`${base}/api/smtp/${action}`, { method: "POST" });
  if (!res.ok) throw new Error(`SMTP fake ${action} failed: ${res.status} ${await res.text()}`);
}

/**
 * Simulates an SMTP relay outage: the shared fake stops listening (connections are refused)
 * until restoreSmtp(), which listens again on the same port. Always restore in a finally/afterEach.
 */
export const stopSmtp = () => smtpControl("stop");
export const restoreSmtp = () => smtpControl("start");
