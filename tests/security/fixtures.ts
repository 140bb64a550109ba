// Ids of real rows for routes with parameters (a notice, a report, a subscription, an aid …),
// read from the seeded database. Absent tables or rows give undefined, and the route that needs
// them fails its case with "no fixture", rather than being skipped silently.
import type { Knex } from "knex";

export interface Fixtures {
  harbourSlug?: string;
  aidId?: number;
  aidCode?: string;
}

async function first<T>(q: Promise<T[]>): Promise<T | undefined> {
  try {
    return (await q)[0];
  } catch {
    return undefined; // table not there (yet)
  }
}

export async function fixtures(db: Knex): Promise<Fixtures> {
  const harbour = await first<{ slug: string }>(db("harbours").select("slug").limit(1));
  const aid = await first<{ id: number; code: string }>(db("aids").select("id", "code").orderBy("id").limit(1));
  return { harbourSlug: harbour?.slug, aidId: aid?.id, aidCode: aid?.code };
}
