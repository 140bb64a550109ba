// `npm start`: the whole product on this machine with demo data. MariaDB (project-local, under
// .local/mariadb), the S3 and SMTP fakes (in this process), migrations, seeds, a production
// build, then the server and worker as child processes. Ctrl-C stops everything it started.
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { startDemoFakes } from "../fakes/main";
import { buildApp, startAppServer, startWorker, stopChildren, waitForHttp, type Child } from "./lib/children";
import { demoDb, demoEnv } from "./lib/demo-env";
import { migrateLatest, runSeeds } from "./lib/knex-ops";
import { ensureMariadbInstalled, startMariadb, stopMariadb } from "./lib/mariadb";
import { DEMO_MARIADB_DIR, ROOT } from "./lib/paths";
import { portFree } from "./lib/ports";

const t0 = Date.now();
const timings: Array<[string, number]> = [];
async function phase<T>(name: string, fn: () => T | Promise<T>): Promise<T> {
  const t = Date.now();
  process.stdout.write(`[start] ${name}… `);
  const result = await fn();
  const ms = Date.now() - t;
  timings.push([name, ms]);
  console.log(`${typeof result === "string" ? result + ", " : ""}${ms} ms`);
  return result;
}

const env = { ...process.env, ...demoEnv() };
let stopMariadbOnExit = false;
let fakes: Awaited<ReturnType<typeof startDemoFakes>> | undefined;
let shuttingDown: Promise<void> | undefined;

// Memoised: Ctrl-C reaches us twice (from the terminal and forwarded by bootstrap.mjs), and a
// second signal must not cut the first shutdown short.
async function shutdown(code: number): Promise<never> {
  shuttingDown ??= (async () => {
    console.log("\n[start] stopping…");
    await stopChildren();
    await fakes?.stop();
    if (stopMariadbOnExit) await stopMariadb(DEMO_MARIADB_DIR);
    console.log("[start] stopped");
  })();
  await shuttingDown;
  process.exit(code);
}
for (const sig of ["SIGINT", "SIGTERM", "SIGHUP"] as const) process.on(sig, () => void shutdown(0));

try {
  // Checked up front: fail in a second rather than after the build, and never let an older
  // server on the port answer our health check.
  if (!(await portFree(Number(env.PORT), env.HOST))) {
    throw new Error(`${env.HOST}:${env.PORT} is already in use (another npm start?). Set PORT to use another port.`);
  }
  await phase("MariaDB installed", () => ensureMariadbInstalled());
  await phase("MariaDB", async () => {
    const r = await startMariadb({ baseDir: DEMO_MARIADB_DIR, ...demoDb(env) });
    // Leave an instance someone else started (e.g. `npm run db:start`) running after Ctrl-C.
    stopMariadbOnExit = r.startedNow;
    return r.startedNow ? `started on 127.0.0.1:${r.port}` : `already running on 127.0.0.1:${r.port}`;
  });
  fakes = await phase("S3 and SMTP fakes", async () => startDemoFakes(env));
  await phase("migrations", async () => {
    const applied = await migrateLatest(env);
    return applied.length ? `${applied.length} applied` : "up to date";
  });
  await phase("demo data", async () => `${(await runSeeds(env)).length} seed file(s)`);
  await phase("build", () => buildApp(env, env.BUILD_DIR ?? "build"));

  const appUrl = `http://${env.HOST}:${env.PORT}`;
  const children: Child[] = [];
  await phase("server", async () => {
    const server = startAppServer(env, env.BUILD_DIR ?? "build");
    children.push(server);
    await waitForHttp(`${appUrl}/healthz`, server);
  });
  const worker = startWorker(env);
  if (worker) children.push(worker);

  console.log(`\nTidewire is running (ready in ${((Date.now() - t0) / 1000).toFixed(1)} s)`);
  console.log(`  App          ${appUrl}/`);
  console.log(`  Mail inbox   ${fakes.inboxUrl}  (every e-mail the app sends lands here)`);
  console.log(`  S3 fake      ${fakes.s3.endpoint}   MariaDB 127.0.0.1:${env.DB_PORT}`);
  const accountsFile = join(ROOT, "seeds/demo-accounts.json");
  if (existsSync(accountsFile)) {
    const accounts = JSON.parse(readFileSync(accountsFile, "utf8")) as Array<{ email: string; password: string; role: string; name?: string }>;
    console.log("\nDemo accounts:");
    const w = Math.max(...accounts.map((a) => a.email.length)) + 2;
    for (const a of accounts) console.log(`  ${a.role.padEnd(14)} ${a.email.padEnd(w)} ${a.password.padEnd(22)} ${a.name ?? ""}`);
  }
  console.log(`\nTimings: ${timings.map(([n, ms]) => `${n} ${ms} ms`).join(", ")}`);
  console.log("Press Ctrl-C to stop.");

  // Whichever child dies first takes the rest down: a half-running demo helps nobody.
  const first = await Promise.race(children.map((c) => c.exited.then((code) => ({ c, code }))));
  if (!shuttingDown) {
    console.error(`[start] ${first.c.name} exited with code ${first.code}`);
    await shutdown(first.code || 1);
  }
} catch (err) {
  console.error(`\n[start] ${(err as Error).message}`);
  await shutdown(1);
}
