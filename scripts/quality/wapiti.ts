// Debian's wapiti against a running app on loopback. It is installed with apt when missing,
// always run with an explicit module list (-m), with its Wappalyzer database pre-seeded (so it
// never tries to download one), and its JSON report parsed: wapiti exits 0 with findings.
//
// Two traps found here: wapiti 3.0.4 advertises `br` in Accept-Encoding but cannot decode it, so
// against a server that compresses with brotli its crawler sees no links and "finds" one URL; we
// send our own Accept-Encoding. And its csrf module reports every form without a token field,
// whatever the server does; the caller verifies each such form by replaying it cross-origin.
// Its `-x` (exclude) option crashes on Python 3.11 (wapitiCore/net/crawler.py wildcard_translate
// appends `(?ms)` after the pattern), so paths the scan must not touch (POST /sign-out, which
// would end the signed-in scan's session) are held back by a small proxy in front of the app.
import { spawn } from "node:child_process";
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { createServer, request as httpRequest, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { join } from "node:path";
import { aptInstall, findProgram } from "../lib/apt";
import { LOCAL } from "../lib/paths";

export const WAPITI_MODULES = ["cookieflags", "csp", "http_headers", "xss", "permanentxss", "redirect", "sql", "exec", "file", "crlf", "csrf", "methods"];

/** wapiti's levels (wapitiCore/language/vulnerability.py): 0 info, 1 low, 2 medium, 3 high, 4 critical. */
export const LEVELS = ["info", "low", "medium", "high", "critical"] as const;

export interface Finding {
  kind: "vulnerability" | "anomaly";
  category: string;
  level: number;
  method: string;
  path: string;
  parameter: string;
  info: string;
  httpRequest: string;
}

export interface WapitiResult {
  urlsFound: number;
  findings: Finding[];
  seconds: number;
  reportFile: string;
}

export function ensureWapiti(): string {
  const found = findProgram("wapiti");
  if (found) return found;
  aptInstall(["wapiti"], "wapiti is missing");
  const again = findProgram("wapiti");
  if (!again) throw new Error("wapiti still missing after apt-get install wapiti");
  return again;
}

/** A loopback proxy to `target` that answers 204 for the listed paths instead of passing them on. */
async function guardProxy(target: string, blocked: string[]): Promise<{ url: string; server: Server }> {
  const t = new URL(target);
  const server = createServer((req, res) => {
    const path = (req.url ?? "/").split("?")[0];
    if (blocked.includes(path)) {
      req.resume();
      res.writeHead(204).end();
      return;
    }
    const up = httpRequest({ host: t.hostname, port: t.port, method: req.method, path: req.url, headers: { ...req.headers, host: t.host } }, (r) => {
      res.writeHead(r.statusCode ?? 502, r.headers);
      r.pipe(res);
    });
    up.on("error", () => res.writeHead(502).end());
    req.pipe(up);
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  return { url: `http://127.0.0.1:${(server.address() as AddressInfo).port}`, server };
}

export async function runWapiti(o: { url: string; name: string; cookie?: string; blockPaths?: string[]; maxScanS?: number; modules?: string[] }): Promise<WapitiResult> {
  const bin = ensureWapiti();
  const proxy = o.blockPaths?.length ? await guardProxy(o.url, o.blockPaths) : undefined;
  try {
    return await scan(bin, { ...o, url: proxy?.url ?? o.url });
  } finally {
    proxy?.server.closeAllConnections();
    proxy?.server.close();
  }
}

async function scan(bin: string, o: { url: string; name: string; cookie?: string; maxScanS?: number; modules?: string[] }): Promise<WapitiResult> {
  const dir = join(LOCAL, "wapiti", o.name);
  mkdirSync(join(dir, "config"), { recursive: true });
  mkdirSync(join(dir, "session"), { recursive: true });
  // Pre-seeded so mod_wapp (if ever listed) reads this instead of downloading a database.
  writeFileSync(join(dir, "config", "apps.json"), JSON.stringify({ apps: {}, categories: {} }));
  const report = join(dir, "report.json");
  const args = [
    "-u", o.url.endsWith("/") ? o.url : o.url + "/",
    "--scope", "folder",
    "-m", (o.modules ?? WAPITI_MODULES).join(","),
    "-H", "Accept-Encoding: gzip, deflate",
    ...(o.cookie ? ["-H", `Cookie: ${o.cookie}`] : []),
    "--flush-session",
    "--store-session", join(dir, "session"),
    "--store-config", join(dir, "config"),
    "-d", "4",
    "--max-links-per-page", "80",
    "--max-scan-time", String(o.maxScanS ?? 300),
    "--max-attack-time", "90",
    "-S", "normal",
    "-f", "json",
    "-o", report,
  ];
  const t = Date.now();
  const out = await new Promise<string>((resolve, reject) => {
    const child = spawn(bin, args, { stdio: ["ignore", "pipe", "pipe"], env: { ...process.env, HOME: dir } });
    let text = "";
    child.stdout.on("data", (d) => (text += d));
    child.stderr.on("data", (d) => (text += d));
    child.on("error", reject);
    child.on("exit", (code) => (code === 0 ? resolve(text) : reject(new Error(`wapiti exited ${code}:\n${text.slice(-3000)}`))));
  });
  const urlsFound = Number(/found (\d+) URLs and forms/.exec(out)?.[1] ?? 0);
  const json = JSON.parse(readFileSync(report, "utf8")) as Record<string, Record<string, Array<Record<string, string>>>>;
  const findings: Finding[] = [];
  for (const [section, kind] of [["vulnerabilities", "vulnerability"], ["anomalies", "anomaly"]] as const) {
    for (const [category, items] of Object.entries(json[section] ?? {})) {
      for (const i of items) {
        findings.push({
          kind,
          category,
          level: Number(i.level),
          method: i.method,
          path: i.path,
          parameter: i.parameter ?? "",
          info: i.info,
          httpRequest: i.http_request ?? "",
        });
      }
    }
  }
  return { urlsFound, findings, seconds: (Date.now() - t) / 1000, reportFile: report };
}
