// All up, all down, all up again, and the schema after the round trip equals the first one.
// Runs on the integration database; tables come back empty, which the other files tolerate
// (each creates its own rows).
import { describe, expect, it } from "vitest";
import { db } from "~/db.server";
import { migrateLatest, migrationStatus, rollbackAll } from "../../scripts/lib/knex-ops";

async function schema(): Promise<Record<string, string>> {
  const [tables] = await db.raw("SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE' ORDER BY table_name");
  const out: Record<string, string> = {};
  for (const { name } of tables as { name: string }[]) {
    const [[row]] = await db.raw("SHOW CREATE TABLE ??", [name]);
    // AUTO_INCREMENT counters differ with the data, not with the schema.
    out[name] = String(row["Create Table"]).replace(/ AUTO_INCREMENT=\d+/, "");
  }
  return out;
}

describe("migrations", () => {
  it("go all up, all down and all up again to the same schema", async () => {
    await migrateLatest(process.env);
    const first = await schema();
    const { completed, pending } = await migrationStatus(process.env);
    expect(pending).toEqual([]);

    const undone = await rollbackAll(process.env);
    expect(undone.length).toBe(completed.length);
    const empty = await schema();
    expect(Object.keys(empty).filter((t) => !t.startsWith("knex_migrations"))).toEqual([]);

    await migrateLatest(process.env);
    expect(await schema()).toEqual(first);
  });

  it("each migration file is timestamped kebab-case with up and down", async () => {
    const { completed } = await migrationStatus(process.env);
    for (const name of completed) {
      expect(name).toMatch(/^\d{14}_[a-z0-9]+(-[a-z0-9]+)*\.ts$/);
      const mod = await import(/* @vite-ignore */ `../../migrations/${name}`);
      expect(typeof mod.up).toBe("function");
      expect(typeof mod.down).toBe("function");
    }
  });
});
