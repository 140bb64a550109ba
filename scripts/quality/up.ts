// `tsx scripts/quality/up.ts [file]`: a quality stack (seeded, with worker) that stays up until
// SIGTERM/Ctrl-C, its URL, env and role cookies written to a JSON file (default
// .local/quality-stack.json) for QUALITY_STACK_FILE=… runs of a suite while developing.
import { writeFileSync } from "node:fs";
import { cookiesByRole } from "./people";
import { startStack } from "./stack";

const file = process.argv[2] ?? ".local/quality-stack.json";
const s = await startStack({ worker: true });
const cookies = await cookiesByRole(s.db, s.env.SESSION_SECRET);
writeFileSync(file, JSON.stringify({ url: s.baseURL, env: s.env, cookies }, null, 1));
console.log(`[quality] up at ${s.baseURL}; details in ${file}`);
for (const sig of ["SIGTERM", "SIGINT"] as const) {
  process.on(sig, () => {
    void s.stop().then(() => process.exit(0));
  });
}
setInterval(() => undefined, 1 << 30);
