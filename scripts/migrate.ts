// `npm run db:migrate` → latest; also `tsx scripts/migrate.ts rollback-all|status`.
// Uses DB_* from the environment (defaults: the demo instance).
import { migrateLatest, migrationStatus, rollbackAll } from "./lib/knex-ops";

const cmd = process.argv[2] ?? "latest";
if (cmd === "latest") {
  const applied = await migrateLatest();
  console.log(applied.length ? `applied ${applied.length}: ${applied.join(", ")}` : "already up to date");
} else if (cmd === "rollback-all") {
  const undone = await rollbackAll();
  console.log(undone.length ? `rolled back ${undone.length}: ${undone.join(", ")}` : "nothing to roll back");
} else if (cmd === "status") {
  const s = await migrationStatus();
  for (const m of s.completed) console.log(`  done     ${m}`);
  for (const m of s.pending) console.log(`  pending  ${m}`);
  console.log(`${s.completed.length} done, ${s.pending.length} pending`);
} else {
  console.error("usage: tsx scripts/migrate.ts latest|rollback-all|status");
  process.exitCode = 2;
}
