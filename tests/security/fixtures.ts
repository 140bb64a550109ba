// Ids of real rows for routes with parameters (a notice, a report, a subscription, an aid …),
// read from the seeded database, creating what the seeds do not have. Absent tables or rows give
// undefined, and the route that needs them fails its case with "no fixture", rather than being
// skipped silently.
import type { Knex } from "knex";

export interface Fixtures {
  harbourSlug?: string;
  aidId?: number;
  aidCode?: string;
  /** A published (in force) notice. */
  noticeId?: number;
  draftNoticeId?: number;
  reportId?: number;
  photoId?: number;
  subscriptionId?: number;
}

async function first<T>(q: PromiseLike<T[]>): Promise<T | undefined> {
  try {
    return (await q)[0];
  } catch {
    return undefined; // table not there (yet)
  }
}

export async function fixtures(db: Knex): Promise<Fixtures> {
  const harbour = await first<{ slug: string }>(db("harbours").select("slug").limit(1));
  const aid = await first<{ id: number; code: string }>(db("aids").select("id", "code").orderBy("id").limit(1));
  const notice = await first<{ id: number }>(db("notices").where({ status: "in_force" }).select("id").orderBy("id").limit(1));
  const draft = await first<{ id: number }>(db("notices").where({ status: "draft" }).select("id").orderBy("id").limit(1));
  const report = await first<{ id: number }>(db("reports").select("id").orderBy("id").limit(1));
  const photo = await first<{ id: number }>(db("report_photos").select("id").orderBy("id").limit(1));
  const sub = await first<{ id: number }>(db("subscriptions").select("id").orderBy("id").limit(1));
  return {
    harbourSlug: harbour?.slug,
    aidId: aid?.id,
    aidCode: aid?.code,
    noticeId: notice?.id,
    draftNoticeId: draft?.id,
    reportId: report?.id,
    photoId: photo?.id,
    subscriptionId: sub?.id,
  };
}
