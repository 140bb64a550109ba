// A project-local MariaDB: its own my.cnf, data directory, socket and logs inside baseDir, bound
// to 127.0.0.1 on a port of our choosing. Nothing under /etc/mysql or /var/lib/mysql is read or
// written, so it can coexist with a system MariaDB and with other instances (tests).
import { spawn, spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { aptInstall, findProgram } from "./apt";

const SBIN = ["/usr/sbin/mariadbd", "/usr/bin/mariadbd"];

function mariadbdPath(): string | undefined {
  return findProgram("mariadbd", SBIN);
}

/** Installs the Debian server and client packages when `mariadbd` is missing. */
export function ensureMariadbInstalled(): void {
  if (mariadbdPath() && findProgram("mariadb")) return;
  // The -core packages hold the server and client binaries only: no system service is started
  // and /var/lib/mysql is not initialised (about 5 s; `mariadb-server` pulls ~80 packages).
  aptInstall(["mariadb-server-core", "mariadb-client-core"], "MariaDB (mariadbd) is missing");
  if (!mariadbdPath()) throw new Error("mariadbd still not found after installing MariaDB");
}

export interface MariadbOptions {
  baseDir: string;
  port: number;
  database: string;
  user: string;
  password: string;
  /** Extra [mariadbd] lines, e.g. durability trade-offs for throwaway test instances. */
  extraServerConfig?: string[];
}

export interface MariadbInstance {
  baseDir: string;
  port: number;
  socket: string;
  pid: number;
  /** False when an instance was already running and this call was a no-op. */
  startedNow: boolean;
}

interface Paths {
  cnf: string;
  datadir: string;
  socket: string;
  pidFile: string;
  log: string;
}

function paths(baseDir: string): Paths {
  const dir = resolve(baseDir);
  // A unix socket path must fit in 108 bytes; a deep checkout would overflow it, so fall back
  // to a name in the temp dir derived from the base dir (stable, so stop/status still find it).
  let socket = join(dir, "mysqld.sock");
  if (Buffer.byteLength(socket) > 100) {
    const h = createHash("sha1").update(dir).digest("hex").slice(0, 12);
    socket = join(tmpdir(), `tidewire-mariadb-${h}.sock`);
  }
  return {
    cnf: join(dir, "my.cnf"),
    datadir: join(dir, "data"),
    socket,
    pidFile: join(dir, "mariadb.pid"),
    log: join(dir, "mariadb.log"),
  };
}

function writeConfig(p: Paths, port: number, extra: string[] = []): void {
  const cnf = [
    "# Written by scripts/lib/mariadb.ts on every start; edits are overwritten.",
    "[client-server]",
    `socket=${p.socket}`,
    `port=${port}`,
    "",
    "[mariadbd]",
    "user=root",
    `datadir=${p.datadir}`,
    `pid-file=${p.pidFile}`,
    `log-error=${p.log}`,
    "bind-address=127.0.0.1",
    "skip-name-resolve",
    "character-set-server=utf8mb4",
    // utf8mb4_unicode_ci / general_ci treat every emoji as equal (unique keys collide).
    "collation-server=utf8mb4_uca1400_ai_ci",
    ...extra,
    "",
  ].join("\n");
  writeFileSync(p.cnf, cnf);
}

/** Runs the mariadb client as root over the socket (root uses unix_socket authentication). */
function sql(p: Paths, statement: string): { ok: boolean; out: string } {
  const r = spawnSync("mariadb", [`--defaults-file=${p.cnf}`, "-uroot", "-N", "-B", "-e", statement], {
    encoding: "utf8",
    timeout: 10_000,
  });
  return { ok: r.status === 0, out: (r.stdout ?? "") + (r.stderr ?? "") };
}

/** Alive and not a zombie (a zombie in a container without an init that reaps stays listed). */
function processAlive(pid: number): boolean {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, "utf8");
    // Format: "pid (comm) S ..." — comm may contain spaces, so read after the last ')'.
    const state = stat.slice(stat.lastIndexOf(")") + 2, stat.lastIndexOf(")") + 3);
    if (state === "Z" || state === "X") return false;
    const cmdline = readFileSync(`/proc/${pid}/cmdline`, "utf8");
    return cmdline.includes("mariadbd") || cmdline.includes("mysqld");
  } catch {
    return false;
  }
}

function readPid(p: Paths): number | undefined {
  try {
    const pid = Number(readFileSync(p.pidFile, "utf8").trim());
    return Number.isInteger(pid) && pid > 0 ? pid : undefined;
  } catch {
    return undefined;
  }
}

function logTail(p: Paths, lines = 20): string {
  try {
    return readFileSync(p.log, "utf8").trimEnd().split("\n").slice(-lines).join("\n");
  } catch {
    return "(no log)";
  }
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function waitUntilAnswering(p: Paths, pid: number, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (sql(p, "SELECT 1").ok) return;
    if (!processAlive(pid)) {
      throw new Error(`mariadbd exited during start-up. Last lines of ${p.log}:\n${logTail(p)}`);
    }
    await sleep(50);
  }
  throw new Error(`mariadbd did not answer within ${timeoutMs} ms. Log ${p.log}:\n${logTail(p)}`);
}

function quoteIdent(s: string): string {
  return "`" + s.replace(/`/g, "``") + "`";
}
function quoteString(s: string): string {
  return "'" + s.replace(/\\/g, "\\\\").replace(/'/g, "\\'") + "'";
}

function ensureDatabaseAndUser(p: Paths, o: MariadbOptions): void {
  const db = quoteIdent(o.database);
  const pw = quoteString(o.password);
  const stmts = [`CREATE DATABASE IF NOT EXISTS ${db} CHARACTER SET utf8mb4 COLLATE utf8mb4_uca1400_ai_ci`];
  // skip-name-resolve: TCP clients match by IP ('127.0.0.1'); 'localhost' covers the socket.
  for (const host of ["127.0.0.1", "localhost"]) {
    const u = `${quoteString(o.user)}@${quoteString(host)}`;
    // ALTER keeps the password in step with the environment when it changed between runs.
    stmts.push(`CREATE USER IF NOT EXISTS ${u} IDENTIFIED BY ${pw}`, `ALTER USER ${u} IDENTIFIED BY ${pw}`);
    stmts.push(`GRANT ALL PRIVILEGES ON ${db}.* TO ${u}`);
  }
  const r = sql(p, stmts.join(";\n"));
  if (!r.ok) throw new Error(`creating database/user failed: ${r.out}`);
}

/**
 * Starts (or finds running) the instance in baseDir, then makes sure the database and app user
 * exist. Idempotent: a live, answering instance is left alone; a stale pid file is recovered.
 */
export async function startMariadb(o: MariadbOptions): Promise<MariadbInstance> {
  const mariadbd = mariadbdPath();
  if (!mariadbd) throw new Error("mariadbd not found: run ensureMariadbInstalled() first");
  const baseDir = resolve(o.baseDir);
  mkdirSync(baseDir, { recursive: true });
  const p = paths(baseDir);

  const existing = readPid(p);
  if (existing && processAlive(existing)) {
    // Possibly still starting (another command started it a moment ago): give it time.
    await waitUntilAnswering(p, existing, 30_000);
    ensureDatabaseAndUser(p, o);
    return { baseDir, port: o.port, socket: p.socket, pid: existing, startedNow: false };
  }
  if (existing) {
    // Stale pid (crash, reboot, killed machine): the socket file is stale too.
    rmSync(p.pidFile, { force: true });
    rmSync(p.socket, { force: true });
  }

  writeConfig(p, o.port, o.extraServerConfig);
  mkdirSync(p.datadir, { recursive: true });
  if (readdirSync(p.datadir).length === 0) {
    // --force: works where the host name does not resolve; socket auth for root means no
    // root password exists anywhere.
    const r = spawnSync(
      "mariadb-install-db",
      [
        `--defaults-file=${p.cnf}`,
        "--user=root",
        "--force",
        "--skip-name-resolve",
        "--auth-root-authentication-method=socket",
        "--skip-test-db",
      ],
      { encoding: "utf8" },
    );
    if (r.status !== 0) {
      rmSync(p.datadir, { recursive: true, force: true });
      throw new Error(`mariadb-install-db failed:\n${r.stdout}\n${r.stderr}`);
    }
  }

  // detached = setsid: the server outlives this process and is not hit by the terminal's
  // Ctrl-C (start.ts stops it explicitly). No inherited stdio: an inherited pipe would keep a
  // CI log or `npm test | tee` open after we exit.
  const child = spawn(mariadbd, [`--defaults-file=${p.cnf}`], { detached: true, stdio: "ignore" });
  child.unref();
  const pid = child.pid;
  if (!pid) throw new Error("could not spawn mariadbd");
  await waitUntilAnswering(p, pid, 60_000);
  ensureDatabaseAndUser(p, o);
  return { baseDir, port: o.port, socket: p.socket, pid, startedNow: true };
}

export type MariadbStatus =
  | { running: true; pid: number; answering: boolean; port?: number }
  | { running: false };

export function mariadbStatus(baseDir: string): MariadbStatus {
  const p = paths(baseDir);
  const pid = readPid(p);
  if (!pid || !processAlive(pid)) return { running: false };
  const port = existsSync(p.cnf) ? Number(/^port=(\d+)/m.exec(readFileSync(p.cnf, "utf8"))?.[1]) : undefined;
  return { running: true, pid, answering: sql(p, "SELECT 1").ok, port };
}

/** Stops the instance in baseDir (SIGTERM, then SIGKILL after 30 s). No-op when not running. */
export async function stopMariadb(baseDir: string): Promise<boolean> {
  const p = paths(baseDir);
  const pid = readPid(p);
  if (!pid || !processAlive(pid)) {
    rmSync(p.pidFile, { force: true });
    return false;
  }
  process.kill(pid, "SIGTERM");
  const deadline = Date.now() + 30_000;
  while (processAlive(pid)) {
    if (Date.now() > deadline) {
      process.kill(pid, "SIGKILL");
      break;
    }
    await sleep(50);
  }
  rmSync(p.pidFile, { force: true });
  return true;
}
