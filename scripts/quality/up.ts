// `tsx scripts/quality/up.ts [file] [--large]`: a quality stack (seeded, with worker) that stays up until
// SIGTERM/Ctrl-C, its URL, env and role cookies written to a JSON file (default
// .local/quality-stack.json) for QUALITY_STACK_FILE=… runs of a suite while developing.
import { writeFileSync } from "node:fs";
import knex from "knex";
import { cookiesByRole } from "./people";
import { seedLarge } from "./seed-large";
import { startStack } from "./stack";

const large = process.argv.includes("--large");
const file = process.argv.slice(2).find((a) => !a.startsWith("--")) ?? ".local/quality-stack.json";
const s = await startStack({
  worker: true,
  beforeApp: large
    ? async (env) => {
        const db = knex({ client: "mysql2", connection: { host: env.DB_HOST, port: Number(env.DB_PORT), user: env.DB_USER, password: env.DB_PASSWORD, database: env.DB_NAME, timezone: "Z" } });
        console.log(await seedLarge(db).finally(() => db.destroy()));
      }
    : undefined,
});
const cookies = await cookiesByRole(s.db, s.env.SESSION_SECRET);
writeFileSync(file, JSON.stringify({ url: s.baseURL, env: s.env, cookies }, null, 1));
console.log(`[quality] up at ${s.baseURL}; details in ${file}`);
for (const sig of ["SIGTERM", "SIGINT"] as const) {
  process.on(sig, () => {
    void s.stop().then(() => process.exit(0));
  });
}
setInterval(() => undefined, 1 << 30);
