// SMTP sink for local runs and tests: accepts every message on 127.0.0.1, saves it to `dir` as
// <id>.eml (raw) and <id>.json (parsed), and serves a small inbox on HTTP for people and tests.
import { randomBytes } from "node:crypto";
import { mkdirSync, readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from "node:fs";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import type { AddressInfo, Server as NetServer } from "node:net";
import { join } from "node:path";
import { simpleParser, type AddressObject } from "mailparser";
import { SMTPServer } from "smtp-server";

export interface CapturedMail {
  id: string;
  receivedAt: string;
  /** Envelope (RCPT TO) addresses, lower-cased: who the message was really sent to. */
  recipients: string[];
  mailFrom: string;
  from: string;
  to: string;
  subject: string;
  date: string | null;
  text: string;
  html: string;
  /** Raw header lines as sent (mailparser folds some headers, e.g. List-Unsubscribe). */
  headerLines: Array<{ key: string; line: string }>;
}

export interface SmtpFake {
  smtpPort: number;
  httpPort: number;
  dir: string;
  /** Captured messages, newest first. */
  messages(): CapturedMail[];
  /** Closes the SMTP listener only (simulates a relay outage); the inbox keeps serving. */
  stopSmtp(): Promise<void>;
  /** Listens again on the same SMTP port after stopSmtp(). */
  startSmtp(): Promise<void>;
  stop(): Promise<void>;
}

function addressText(a: AddressObject | AddressObject[] | undefined): string {
  if (!a) return "";
  return (Array.isArray(a) ? a : [a]).map((x) => x.text).join(", ");
}

/** Newest first. Files are read on every call so several processes can share one directory. */
export function readMessages(dir: string): CapturedMail[] {
  let files: string[];
  try {
    files = readdirSync(dir).filter((f) => f.endsWith(".json"));
  } catch {
    return [];
  }
  return files
    .sort()
    .reverse()
    .flatMap((f) => {
      try {
        return [JSON.parse(readFileSync(join(dir, f), "utf8")) as CapturedMail];
      } catch {
        return []; // removed between readdir and read
      }
    });
}

let seq = 0;
function newId(): string {
  // Sorts by time; the counter orders messages within one millisecond.
  const t = new Date().toISOString().replace(/[-:.]/g, "");
  return `${t}-${String(seq++ % 10000).padStart(4, "0")}-${randomBytes(3).toString("hex")}`;
}

function listen(server: NetServer, port: number) {
  return new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, "127.0.0.1", () => {
      server.off("error", reject);
      resolve();
    });
  });
}

function createSmtp(dir: string): SMTPServer {
  const server = new SMTPServer({
    // smtp-server's bundled certificate has expired: offering STARTTLS would break clients.
    disabledCommands: ["STARTTLS"],
    authOptional: true,
    allowInsecureAuth: true,
    onAuth: (auth, _session, cb) => cb(null, { user: auth.username ?? "fake" }),
    logger: false,
    banner: "Tidewire local SMTP fake",
    size: 25 * 1024 * 1024,
    // A stop() must not wait 30 s for pooled client connections to hang up.
    closeTimeout: 200,
    onData(stream, session, cb) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", async () => {
        try {
          const raw = Buffer.concat(chunks);
          const parsed = await simpleParser(raw);
          const id = newId();
          const mail: CapturedMail = {
            id,
            receivedAt: new Date().toISOString(),
            recipients: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
            mailFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
            from: addressText(parsed.from),
            to: addressText(parsed.to),
            subject: parsed.subject ?? "",
            date: parsed.date ? parsed.date.toISOString() : null,
            text: parsed.text ?? "",
            html: typeof parsed.html === "string" ? parsed.html : "",
            headerLines: parsed.headerLines.map((h) => ({ key: h.key, line: h.line })),
          };
          writeFileSync(join(dir, `${id}.eml`), raw);
          // Write-then-rename: a reader never sees half a JSON file, and the .json appearing
          // means the .eml is complete too.
          const tmp = join(dir, `.${id}.json.tmp`);
          writeFileSync(tmp, JSON.stringify(mail, null, 2));
          renameSync(tmp, join(dir, `${id}.json`));
          cb();
        } catch (err) {
          cb(err as Error);
        }
      });
    },
  });
  // A client that drops mid-session (a worker killed while sending) raises "error": log it, do
  // not let it take down the process hosting the fake.
  server.on("error", (e) => console.error(`[smtp fake] ${e.message}`));
  return server;
}

const esc = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${esc(title)}</title>
<meta name="viewport" content="width=device-width, initial-scale=1">
<style>
body{font:15px/1.45 system-ui,sans-serif;margin:0;color:#10243a;background:#f4f7fa}
header{background:#0b3a5b;color:#fff;padding:.8rem 1.2rem}header a{color:#fff}
main{padding:1rem 1.2rem;max-width:70rem}table{border-collapse:collapse;width:100%;background:#fff}
th,td{text-align:left;padding:.4rem .6rem;border-bottom:1px solid #d5dee8;vertical-align:top}
pre{white-space:pre-wrap;background:#fff;padding:.8rem;border:1px solid #d5dee8}
iframe{width:100%;height:32rem;border:1px solid #d5dee8;background:#fff}
.muted{color:#52657a}
</style></head><body><header><strong><a href="/">Tidewire local mail inbox</a></strong>
<span class="muted" style="color:#cfe0ee"> — captured by the SMTP fake; nothing here was delivered</span></header>
<main>${body}</main></body></html>`;
}

function listPage(msgs: CapturedMail[]): string {
  if (msgs.length === 0) return page("Inbox", "<p>No mail captured yet.</p>");
  const rows = msgs
    .map(
      (m) =>
        `<tr><td>${esc(m.date ?? m.receivedAt)}</td><td>${esc(m.to || m.recipients.join(", "))}</td>` +
        `<td><a href="/messages/${encodeURIComponent(m.id)}">${esc(m.subject || "(no subject)")}</a></td></tr>`,
    )
    .join("\n");
  return page(
    "Inbox",
    `<p>${msgs.length} message(s), newest first.</p><table><thead><tr><th>Date</th><th>To</th><th>Subject</th></tr></thead><tbody>${rows}</tbody></table>`,
  );
}

function messagePage(m: CapturedMail): string {
  const headers = m.headerLines
    .map((h) => `<tr><th>${esc(h.key)}</th><td><code>${esc(h.line)}</code></td></tr>`)
    .join("");
  // The HTML part runs in a sandboxed iframe without scripts: captured mail is untrusted.
  const html = m.html
    ? `<h2>HTML</h2><iframe sandbox title="HTML part" srcdoc="${esc(m.html)}"></iframe>`
    : "<p class=muted>No HTML part.</p>";
  return page(
    m.subject || "(no subject)",
    `<p><a href="/">← all mail</a> · <a href="/messages/${encodeURIComponent(m.id)}.eml">raw .eml</a></p>
<h1>${esc(m.subject || "(no subject)")}</h1>
<h2>Headers</h2><table>${headers}</table>
<h2>Text</h2><pre>${esc(m.text || "(no text part)")}</pre>${html}`,
  );
}

interface SmtpControl {
  stopSmtp(): Promise<void>;
  startSmtp(): Promise<void>;
}

function inboxHandler(dir: string, control: SmtpControl) {
  return (req: IncomingMessage, res: ServerResponse) => {
    const url = new URL(req.url ?? "/", "http://127.0.0.1");
    const send = (status: number, type: string, body: string | Buffer) => {
      res.writeHead(status, {
        "content-type": type,
        "cache-control": "no-store",
        "x-content-type-options": "nosniff",
        "content-security-policy": "script-src 'none'; object-src 'none'; frame-ancestors 'none'",
      });
      res.end(body);
    };
    const json = (status: number, body: unknown) => send(status, "application/json", JSON.stringify(body));
    const path = url.pathname;
    if (req.method === "GET" && path === "/") return send(200, "text/html; charset=utf-8", listPage(readMessages(dir)));
    if (req.method === "GET" && path === "/api/messages") return json(200, readMessages(dir));
    if (req.method === "DELETE" && path === "/api/messages") {
      for (const f of readdirSync(dir)) rmSync(join(dir, f), { force: true });
      return json(200, { deleted: true });
    }
    // Lets a test in another process simulate a relay outage on the shared fake.
    if (req.method === "POST" && (path === "/api/smtp/stop" || path === "/api/smtp/start")) {
      const action = path.endsWith("stop") ? control.stopSmtp() : control.startSmtp();
      void action.then(
        () => json(200, { smtp: path.endsWith("stop") ? "stopped" : "listening" }),
        (err: Error) => json(500, { error: err.message }),
      );
      return;
    }
    const m = /^\/(api\/)?messages\/([\w-]+?)(\.eml)?$/.exec(path);
    if (req.method === "GET" && m) {
      const msg = readMessages(dir).find((x) => x.id === m[2]);
      if (!msg) return m[1] ? json(404, { error: "no such message" }) : send(404, "text/html; charset=utf-8", page("Not found", "<p>No such message.</p>"));
      if (m[3]) return send(200, "message/rfc822", readFileSync(join(dir, `${msg.id}.eml`)));
      return m[1] ? json(200, msg) : send(200, "text/html; charset=utf-8", messagePage(msg));
    }
    return json(404, { error: "not found" });
  };
}

/**
 * Starts the SMTP sink and its HTTP inbox. Port 0 picks a free port (see the returned ports).
 * Stopping and starting again on the same ports and dir keeps earlier mail.
 */
export async function startSmtpFake(o: { smtpPort: number; httpPort: number; dir: string }): Promise<SmtpFake> {
  mkdirSync(o.dir, { recursive: true });
  let smtp: SMTPServer | undefined = createSmtp(o.dir);
  await listen(smtp.server, o.smtpPort);
  const smtpPort = (smtp.server.address() as AddressInfo).port;

  const stopSmtp = async () => {
    if (!smtp) return;
    const s = smtp;
    smtp = undefined;
    await new Promise<void>((r) => s.close(() => r()));
  };
  const startSmtp = async () => {
    if (smtp) return;
    const s = createSmtp(o.dir);
    await listen(s.server, smtpPort);
    smtp = s;
  };

  const http = createServer(inboxHandler(o.dir, { stopSmtp, startSmtp }));
  try {
    await listen(http, o.httpPort);
  } catch (err) {
    await stopSmtp();
    throw err;
  }
  const httpPort = (http.address() as AddressInfo).port;

  return {
    smtpPort,
    httpPort,
    dir: o.dir,
    messages: () => readMessages(o.dir),
    stopSmtp,
    startSmtp,
    async stop() {
      await stopSmtp();
      await new Promise<void>((r) => {
        http.close(() => r());
        http.closeAllConnections();
      });
    },
  };
}
