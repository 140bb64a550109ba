// The public data's revision, for page validators: one indexed round trip that tells whether a
// public page may have changed since a client (or the page cache) last saw it.
import { db as defaultDb, type Db } from "~/db.server";

export type PublicRevision = {
  /** Replaced by triggers on every write to notices (see migrations/…_create-public-revisions). */
  notices: string | null;
  /** Replaced on every write to aids (names and codes show on notice pages). */
  aids: string | null;
  /**
   * The latest end of validity that has passed for a notice still marked in force: a notice
   * lapses by the clock before the expiry job writes anything, and this moves when it does.
   */
  lapsedAt: string | null;
};

export async function publicRevision(db: Db = defaultDb, now = new Date()): Promise<PublicRevision> {
  const [rows] = (await db.raw(
    `SELECT (SELECT token FROM public_revisions WHERE name = 'notices') AS notices,
            (SELECT token FROM public_revisions WHERE name = 'aids') AS aids,
            (SELECT MAX(valid_until) FROM notices WHERE status = 'in_force' AND valid_until <= ?) AS lapsed`,
    [now],
  )) as [Array<{ notices: string | null; aids: string | null; lapsed: Date | null }>];
  const r = rows[0];
  return { notices: r?.notices ?? null, aids: r?.aids ?? null, lapsedAt: r?.lapsed ? new Date(r.lapsed).toISOString() : null };
}
