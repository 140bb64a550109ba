// `npm run db:start|db:stop` (and `tsx scripts/db.ts status`): the demo MariaDB under
// .local/mariadb on DB_PORT (default 3407).
import { demoDb } from "./lib/demo-env";
import { ensureMariadbInstalled, mariadbStatus, startMariadb, stopMariadb } from "./lib/mariadb";
import { DEMO_MARIADB_DIR } from "./lib/paths";

const cmd = process.argv[2];
const db = demoDb();

if (cmd === "start") {
  ensureMariadbInstalled();
  const t0 = Date.now();
  const m = await startMariadb({ baseDir: DEMO_MARIADB_DIR, ...db });
  console.log(
    m.startedNow
      ? `MariaDB started on 127.0.0.1:${m.port} (pid ${m.pid}) in ${Date.now() - t0} ms`
      : `MariaDB already running on 127.0.0.1:${m.port} (pid ${m.pid})`,
  );
} else if (cmd === "stop") {
  console.log((await stopMariadb(DEMO_MARIADB_DIR)) ? "MariaDB stopped" : "MariaDB was not running");
} else if (cmd === "status") {
  const s = mariadbStatus(DEMO_MARIADB_DIR);
  console.log(s.running ? `running (pid ${s.pid}, port ${s.port}, ${s.answering ? "answering" : "not answering"})` : "not running");
  process.exitCode = s.running && s.answering ? 0 : 1;
} else {
  console.error("usage: tsx scripts/db.ts start|stop|status");
  process.exitCode = 2;
}
