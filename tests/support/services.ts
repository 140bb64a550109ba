// Throwaway services for integration and end-to-end tests: a MariaDB instance on tmpfs, the S3
// and SMTP fakes, each on a free port with its own temp directory, so test runs never touch the
// demo data and several runs can coexist. Migrations are applied; no seed data.
import { randomBytes } from "node:crypto";
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { startS3Fake } from "../../fakes/s3";
import { startSmtpFake } from "../../fakes/smtp";
import { migrateLatest } from "../../scripts/lib/knex-ops";
import { ensureMariadbInstalled, startMariadb, stopMariadb } from "../../scripts/lib/mariadb";
import { freePort } from "../../scripts/lib/ports";

export interface TestServices {
  /** DB_*, S3_*, SMTP_*, MAIL_FROM, SESSION_SECRET, plus TEST_MAIL_DIR / TEST_MAIL_INBOX_URL. */
  env: Record<string, string>;
  timingsMs: Record<string, number>;
  stop(): Promise<void>;
}

const OWNER_FILE = "owner.pid";

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/**
 * A test run that was killed (Ctrl-C twice, OOM, CI timeout) cannot stop its MariaDB. Each run
 * writes its own pid into its directory; directories whose owner is gone are stopped and removed.
 */
async function sweepOrphans(shm: string): Promise<void> {
  for (const name of readdirSync(shm)) {
    if (!name.startsWith("tidewire-test-")) continue;
    const dir = join(shm, name);
    let owner: number;
    try {
      owner = Number(readFileSync(join(dir, OWNER_FILE), "utf8"));
    } catch {
      continue; // being set up right now by another run, or not ours
    }
    if (!owner || alive(owner)) continue;
    await stopMariadb(dir);
    rmSync(dir, { recursive: true, force: true });
  }
}

export async function startTestServices(opts: { migrate?: boolean } = {}): Promise<TestServices> {
  const timingsMs: Record<string, number> = {};
  let t = Date.now();
  const lap = (name: string) => {
    timingsMs[name] = Date.now() - t;
    t = Date.now();
  };
  ensureMariadbInstalled();
  // tmpfs makes the DDL-heavy setup several times faster than disk.
  const shm = existsSync("/dev/shm") ? "/dev/shm" : tmpdir();
  await sweepOrphans(shm);
  const dbDir = mkdtempSync(join(shm, "tidewire-test-"));
  writeFileSync(join(dbDir, OWNER_FILE), String(process.pid));
  const filesDir = mkdtempSync(join(tmpdir(), "tidewire-test-files-"));
  const cleanups: Array<() => Promise<unknown> | void> = [];
  const stop = async () => {
    for (const c of cleanups.reverse()) await c();
    rmSync(dbDir, { recursive: true, force: true });
    rmSync(filesDir, { recursive: true, force: true });
  };

  try {
    const db = { port: await freePort(), user: "tidewire", password: "test-" + randomBytes(6).toString("hex"), database: "tidewire_test" };
    await startMariadb({
      baseDir: dbDir,
      ...db,
      // Durability is worthless for a database deleted after the run.
      extraServerConfig: ["innodb_flush_log_at_trx_commit=0", "innodb_doublewrite=0", "skip-log-bin"],
    });
    cleanups.push(() => stopMariadb(dbDir));
    lap("mariadb");

    const bucket = "tidewire-test";
    const s3 = await startS3Fake({ port: 0, dir: join(filesDir, "s3"), bucket });
    cleanups.push(() => s3.stop());
    const mailDir = join(filesDir, "mail");
    const smtp = await startSmtpFake({ smtpPort: 0, httpPort: 0, dir: mailDir });
    cleanups.push(() => smtp.stop());
    lap("fakes");

    const env: Record<string, string> = {
      DB_HOST: "127.0.0.1",
      DB_PORT: String(db.port),
      DB_USER: db.user,
      DB_PASSWORD: db.password,
      DB_NAME: db.database,
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
      APP_URL: "http://127.0.0.1:3000",
      TEST_MAIL_DIR: mailDir,
      TEST_MAIL_INBOX_URL: `http://127.0.0.1:${smtp.httpPort}`,
    };
    if (opts.migrate !== false) {
      await migrateLatest(env);
      lap("migrations");
    }
    return { env, timingsMs, stop };
  } catch (err) {
    await stop();
    throw err;
  }
}
