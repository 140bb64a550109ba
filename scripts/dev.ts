// `npm run dev`: the same MariaDB, fakes, migrations and demo data as `npm start`, then the Vite
// dev server (react-router dev) with hot reload instead of a production build. Ctrl-C stops all.
import { join } from "node:path";
import { startDemoFakes } from "../fakes/main";
import { spawnChild, stopChildren } from "./lib/children";
import { demoDb, demoEnv } from "./lib/demo-env";
import { migrateLatest, runSeeds } from "./lib/knex-ops";
import { ensureMariadbInstalled, startMariadb, stopMariadb } from "./lib/mariadb";
import { DEMO_MARIADB_DIR, ROOT } from "./lib/paths";

const demo = demoEnv();
const env: NodeJS.ProcessEnv = { ...process.env, ...demo, NODE_ENV: "development" };
ensureMariadbInstalled();
const db = await startMariadb({ baseDir: DEMO_MARIADB_DIR, ...demoDb(env) });
const fakes = await startDemoFakes(env);
await migrateLatest(env);
await runSeeds(env);
console.log(`[dev] MariaDB 127.0.0.1:${db.port}, mail inbox ${fakes.inboxUrl}`);

const vite = spawnChild(
  "react-router dev",
  process.execPath,
  [join(ROOT, "node_modules/@react-router/dev/bin.js"), "dev", "--host", demo.HOST!, "--port", demo.PORT!],
  { env },
);
let stopping: Promise<void> | undefined;
const shutdown = () =>
  (stopping ??= (async () => {
    await stopChildren();
    await fakes.stop();
    if (db.startedNow) await stopMariadb(DEMO_MARIADB_DIR);
  })()).then(() => process.exit(0));
for (const sig of ["SIGINT", "SIGTERM", "SIGHUP"] as const) process.on(sig, () => void shutdown());
const code = await vite.exited;
if (!stopping) {
  await shutdown();
  process.exitCode = code;
}
