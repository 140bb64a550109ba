// The whole product on throwaway services for the quality suites (faults, fuzz, security, a11y,
// load): a MariaDB on /dev/shm that a test may SIGKILL and start again on the same port and data,
// the S3 and SMTP fakes (stoppable and restartable on the same ports), migrations, seeds, the
// production build served by scripts/serve.ts (one or more instances sharing the database) and,
// when asked, the worker. Everything started here is stopped by pid in stop().
import { randomBytes } from "node:crypto";
import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import knex, { type Knex } from "knex";
import { SMTPServer } from "smtp-server";
import { startS3Fake, type S3Fake } from "../../fakes/s3";
import { startSmtpFake, type SmtpFake } from "../../fakes/smtp";
import { buildApp, spawnChild, startAppServer, startWorker, stopChildren, waitForHttp, type Child } from "../lib/children";
import { migrateLatest, runSeeds } from "../lib/knex-ops";
import { ensureMariadbInstalled, startMariadb, stopMariadb } from "../lib/mariadb";
import { claimBuildDir } from "../lib/build-dir";
import { LOCAL, ROOT } from "../lib/paths";
import { freePort } from "../lib/ports";

// fakes/smtp.ts registers no "error" listener on its SMTPServer, so a client that vanishes
// mid-session (a worker SIGKILLed while sending) emits an unhandled "error" (ECONNRESET) that
// takes the whole process down. Until the fake handles it, every SMTP server started here does.
const listen = SMTPServer.prototype.listen;
SMTPServer.prototype.listen = function (this: SMTPServer, ...args: Parameters<typeof listen>) {
  if (this.listenerCount("error") === 0) this.on("error", () => undefined);
  return listen.apply(this, args);
} as typeof listen;

export interface StackOptions {
  /** Run seeds/*.ts (demo accounts, Kestrel Sound, aids …). Default true. */
  seed?: boolean;
  /** How many app server processes (each on its own port, all on one database). Default 1. */
  instances?: number;
  /** WEB_CONCURRENCY for each instance (node:cluster inside scripts/serve.ts). Default 1. */
  webConcurrency?: number;
  /** Start the outbox worker. Default false. */
  worker?: boolean;
  /** Commit every transaction to the log (needed when a test SIGKILLs MariaDB). Default true. */
  durable?: boolean;
  /** Extra env for the app processes. */
  appEnv?: Record<string, string>;
  /** Show the server's output (default: only on failure to start). */
  quiet?: boolean;
  /** Called after migrations and seeds, before the app starts (e.g. the large dataset). */
  beforeApp?: (env: Record<string, string>) => Promise<void>;
}

export interface Stack {
  env: Record<string, string>;
  baseURL: string;
  /** One per instance; baseURL is the first. */
  urls: string[];
  servers: Child[];
  buildDir: string;
  mailDir: string;
  /** Our own connection for assertions and set-up (not the app's pool). */
  db: Knex;
  dbPid(): number;
  /** SIGKILL mariadbd (no shutdown, as a crash). */
  killDb(): void;
  /** Start mariadbd again on the same port and data directory (crash recovery runs). */
  startDb(): Promise<void>;
  smtp: SmtpFake;
  stopS3(): Promise<void>;
  startS3(): Promise<void>;
  worker?: Child;
  startWorker(extraEnv?: Record<string, string>): Child;
  stop(): Promise<void>;
}


export async function startStack(o: StackOptions = {}): Promise<Stack> {
  ensureMariadbInstalled();
  const shm = existsSync("/dev/shm") ? "/dev/shm" : tmpdir();
  const dbDir = mkdtempSync(join(shm, "tidewire-quality-"));
  const filesDir = mkdtempSync(join(tmpdir(), "tidewire-quality-files-"));
  const build = claimBuildDir("build-quality");
  const cleanups: Array<() => Promise<unknown> | void> = [];
  let ownDb: Knex | undefined;
  const stop = async () => {
    await stopChildren(5000);
    await ownDb?.destroy().catch(() => undefined);
    for (const c of cleanups.reverse()) await Promise.resolve(c()).catch(() => undefined);
    rmSync(dbDir, { recursive: true, force: true });
    rmSync(filesDir, { recursive: true, force: true });
    build.release();
  };
  try {
    const dbo = {
      baseDir: dbDir,
      port: await freePort(),
      user: "tidewire",
      password: "q-" + randomBytes(6).toString("hex"),
      database: "tidewire_quality",
      extraServerConfig: [
        "skip-log-bin",
        "innodb_doublewrite=0",
        "max_connections=400",
        ...(o.durable === false ? ["innodb_flush_log_at_trx_commit=0"] : []),
      ],
    };
    await startMariadb(dbo);
    cleanups.push(() => stopMariadb(dbDir));

    const bucket = "tidewire-quality";
    const s3Dir = join(filesDir, "s3");
    let s3: S3Fake | undefined = await startS3Fake({ port: 0, dir: s3Dir, bucket });
    const s3Port = s3.port;
    cleanups.push(() => s3?.stop());
    const mailDir = join(filesDir, "mail");
    const smtp = await startSmtpFake({ smtpPort: 0, httpPort: 0, dir: mailDir });
    cleanups.push(() => smtp.stop());

    const env: Record<string, string> = {
      DB_HOST: "127.0.0.1",
      DB_PORT: String(dbo.port),
      DB_USER: dbo.user,
      DB_PASSWORD: dbo.password,
      DB_NAME: dbo.database,
      S3_ENDPOINT: s3.endpoint,
      S3_REGION: "us-east-1",
      S3_BUCKET: bucket,
      S3_ACCESS_KEY_ID: "S3RVER",
      S3_SECRET_ACCESS_KEY: "S3RVER",
      S3_FORCE_PATH_STYLE: "true",
      SMTP_HOST: "127.0.0.1",
      SMTP_PORT: String(smtp.smtpPort),
      SMTP_SECURE: "false",
      MAIL_FROM: "Tidewire <no-reply@tidewire.test>",
      SESSION_SECRET: randomBytes(32).toString("base64url"),
      TEST_MAIL_DIR: mailDir,
      TEST_MAIL_INBOX_URL: `http://127.0.0.1:${smtp.httpPort}`,
      WORKER_POLL_MS: "200",
    };
    await migrateLatest(env);
    if (o.seed !== false) await runSeeds(env);
    await o.beforeApp?.(env);

    const instances = o.instances ?? 1;
    const ports: number[] = [];
    for (let i = 0; i < instances; i++) ports.push(await freePort());
    const urls = ports.map((p) => `http://127.0.0.1:${p}`);
    // APP_URL is the first instance: the origin check accepts the request's own origin too.
    env.APP_URL = urls[0];
    const appEnv = (port: number) => ({
      ...process.env,
      ...env,
      ...o.appEnv,
      HOST: "127.0.0.1",
      PORT: String(port),
      WEB_CONCURRENCY: String(o.webConcurrency ?? 1),
    });
    await buildApp(appEnv(ports[0]), build.dir);
    const servers: Child[] = [];
    for (const port of ports) {
      const s = o.quiet === false ? startAppServer(appEnv(port), build.dir) : startQuietServer(appEnv(port), build.dir);
      servers.push(s);
      await waitForHttp(`http://127.0.0.1:${port}/healthz`, s, 60_000);
    }

    ownDb = knex({
      client: "mysql2",
      connection: { host: "127.0.0.1", port: dbo.port, user: dbo.user, password: dbo.password, database: dbo.database, timezone: "Z" },
      pool: { min: 0, max: 4 },
    });

    const pidFile = join(dbDir, "mariadb.pid");
    const stack: Stack = {
      env,
      baseURL: urls[0],
      urls,
      servers,
      buildDir: build.dir,
      mailDir,
      db: ownDb,
      dbPid: () => Number(readFileSync(pidFile, "utf8").trim()),
      killDb() {
        process.kill(stack.dbPid(), "SIGKILL");
      },
      async startDb() {
        // The pid is gone, but the dead pid file stays: startMariadb recovers from that.
        const deadline = Date.now() + 10_000;
        while (Date.now() < deadline && existsSync(`/proc/${stack.dbPid()}/stat`) && !/\) [ZX]/.test(readFileSync(`/proc/${stack.dbPid()}/stat`, "utf8"))) {
          await new Promise((r) => setTimeout(r, 50));
        }
        await startMariadb(dbo);
      },
      smtp,
      async stopS3() {
        await s3?.stop();
        s3 = undefined;
      },
      async startS3() {
        s3 = await startS3Fake({ port: s3Port, dir: s3Dir, bucket });
      },
      startWorker(extraEnv = {}) {
        const w = startWorker({ ...appEnv(ports[0]), ...extraEnv });
        if (!w) throw new Error("app/worker/main.ts is missing");
        stack.worker = w;
        return w;
      },
      stop,
    };
    if (o.worker) stack.startWorker();
    return stack;
  } catch (err) {
    await stop();
    throw err;
  }
}

/** scripts/serve.ts with its output kept to ourselves, printed only if it dies. */
function startQuietServer(env: NodeJS.ProcessEnv, buildDir: string): Child {
  const child = spawnChild("server", process.execPath, ["--import", "tsx", join(ROOT, "scripts/serve.ts")], {
    env: { ...env, NODE_ENV: "production", BUILD_DIR: buildDir },
    quiet: true,
  });
  let out = "";
  const keep = (d: Buffer) => {
    out = (out + d.toString()).slice(-400_000);
  };
  child.proc.stdout?.on("data", keep);
  child.proc.stderr?.on("data", keep);
  (child as Child & { output(): string }).output = () => out;
  void child.exited.then((code) => {
    if (code !== 0 && code !== 143 && code !== 130) process.stderr.write(`[server exited ${code}]\n${out}\n`);
  });
  return child;
}

/** The last output of a quiet server (for assertions such as "no stack traces logged"). */
export function serverOutput(child: Child): string {
  return (child as Child & { output?: () => string }).output?.() ?? "";
}
