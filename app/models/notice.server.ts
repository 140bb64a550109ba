// Notices (local navigational warnings): drafts, publication with gap-free numbering, amendment,
// cancellation, supersession and expiry. Every state change runs in one transaction with its
// audit row and the onNoticeEvent hook, so alerts commit or roll back with the change.
import type { Knex } from "knex";
import { db as defaultDb, type Db } from "~/db.server";
import { buildPartGeometry, circleRing, closedCcwRing, toWkt, type LonLat, type PartGeometry } from "~/lib/notices/geometry";
import type { NoticeInput, ParsedPart } from "~/lib/notices/schema";
import type { NoticePart, NoticeView } from "~/lib/notices/types";
import { formatSeriesNumber, type NoticeStatus } from "~/lib/notices/vocabulary";
import { onNoticeEvent, type NoticeEventKind } from "~/services/notice-events.server";
import { getHarbourById, withinBoundary } from "./harbour.server";

/** An expected refusal, shown beside a field (or as JSON `{ error, field }`) with its status. */
export class NoticeError extends Error {
  constructor(
    message: string,
    readonly field: string,
    readonly status: 400 | 403 | 404 | 409 = 400,
  ) {
    super(message);
    this.name = "NoticeError";
  }
}

export type Actor = { id: number; role: string } | null;

type NoticeRow = {
  id: number;
  harbour_id: number;
  series_code: string | null;
  year: number | null;
  number: number | null;
  title: string;
  general_type: string;
  detail_types: string;
  restrictions: string;
  urgency: "urgent" | "routine";
  status: NoticeStatus;
  position_status: "reported" | "located";
  valid_from: Date;
  valid_until: Date | null;
  general_area: string;
  locality: string;
  charts: string;
  body: string;
  supersedes_notice_id: number | null;
  superseded_by_notice_id: number | null;
  related_refs: string;
  outside_boundary_accepted: number;
  cancellation_reason: string | null;
  published_at: Date | null;
  cancelled_at: Date | null;
  expired_at: Date | null;
  created_by: number | null;
  version: number;
  created_at: Date;
  updated_at: Date;
  sup_code?: string | null;
  sup_year?: number | null;
  sup_number?: number | null;
  supby_code?: string | null;
  supby_year?: number | null;
  supby_number?: number | null;
};

type PartRow = {
  id: number;
  notice_id: number;
  seq: number;
  kind: NoticePart["kind"];
  positions_text: string;
  crs: string;
  radius_nm: string | number | null;
  coordinates_json: string;
};

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);
const series = (code: string | null | undefined, year: number | null | undefined, number: number | null | undefined) =>
  code && year && number ? formatSeriesNumber(code, year, number) : null;

function effectiveStatus(r: Pick<NoticeRow, "status" | "valid_until">, now: Date): NoticeStatus {
  if (r.status === "in_force" && r.valid_until && new Date(r.valid_until).getTime() <= now.getTime()) return "expired";
  return r.status;
}

const circleCache = new Map<string, LonLat[]>();
function partGeometry(kind: NoticePart["kind"], coords: LonLat[], radiusNm: number | null): PartGeometry {
  if (kind === "point") return { type: "Point", coordinates: coords[0]! };
  if (kind === "line") return { type: "LineString", coordinates: coords };
  if (kind === "area") return { type: "Polygon", coordinates: [closedCcwRing(coords)] };
  const key = `${coords[0]![0]},${coords[0]![1]},${radiusNm}`;
  let ring = circleCache.get(key);
  if (!ring) {
    ring = circleRing(coords[0]!, radiusNm ?? 0);
    if (circleCache.size > 5000) circleCache.clear();
    circleCache.set(key, ring);
  }
  return { type: "Polygon", coordinates: [ring] };
}

function toPart(p: PartRow): NoticePart {
  const coordinates = JSON.parse(p.coordinates_json) as LonLat[];
  const radiusNm = p.radius_nm == null ? null : Number(p.radius_nm);
  return {
    id: p.id,
    seq: p.seq,
    kind: p.kind,
    positionsText: p.positions_text,
    crs: p.crs,
    radiusNm,
    coordinates,
    geometry: partGeometry(p.kind, coordinates, radiusNm),
  };
}

function toView(r: NoticeRow, parts: NoticePart[], now: Date, links?: { aids: NoticeView["aids"]; reportIds: number[] }): NoticeView {
  return {
    id: r.id,
    harbourId: r.harbour_id,
    seriesNumber: series(r.series_code, r.year, r.number),
    seriesCode: r.series_code,
    year: r.year,
    number: r.number,
    title: r.title,
    generalType: r.general_type as NoticeView["generalType"],
    detailTypes: JSON.parse(r.detail_types || "[]"),
    restrictions: JSON.parse(r.restrictions || "[]"),
    urgency: r.urgency,
    status: r.status,
    effectiveStatus: effectiveStatus(r, now),
    positionStatus: r.position_status,
    validFrom: iso(r.valid_from)!,
    validUntil: iso(r.valid_until),
    generalArea: r.general_area,
    locality: r.locality,
    charts: r.charts,
    body: r.body,
    supersedesNoticeId: r.supersedes_notice_id,
    supersedesSeriesNumber: series(r.sup_code, r.sup_year, r.sup_number),
    supersededByNoticeId: r.superseded_by_notice_id,
    supersededBySeriesNumber: series(r.supby_code, r.supby_year, r.supby_number),
    relatedRefs: r.related_refs,
    cancellationReason: r.cancellation_reason,
    publishedAt: iso(r.published_at),
    cancelledAt: iso(r.cancelled_at),
    expiredAt: iso(r.expired_at),
    outsideBoundaryAccepted: !!r.outside_boundary_accepted,
    version: r.version,
    createdAt: iso(r.created_at)!,
    updatedAt: iso(r.updated_at)!,
    parts,
    aids: links?.aids ?? [],
    reportIds: links?.reportIds ?? [],
  };
}

function baseSelect(db: Db) {
  return db("notices as n")
    .leftJoin("notices as sup", "sup.id", "n.supersedes_notice_id")
    .leftJoin("notices as supby", "supby.id", "n.superseded_by_notice_id")
    .select(
      "n.*",
      "sup.series_code as sup_code",
      "sup.year as sup_year",
      "sup.number as sup_number",
      "supby.series_code as supby_code",
      "supby.year as supby_year",
      "supby.number as supby_number",
    );
}

async function partsFor(ids: number[], db: Db): Promise<Map<number, NoticePart[]>> {
  const byNotice = new Map<number, NoticePart[]>();
  if (ids.length === 0) return byNotice;
  const rows = (await db("notice_parts")
    .select("id", "notice_id", "seq", "kind", "positions_text", "crs", "radius_nm", "coordinates_json")
    .whereIn("notice_id", ids)
    .orderBy(["notice_id", "seq"])) as PartRow[];
  for (const r of rows) {
    const list = byNotice.get(r.notice_id) ?? [];
    list.push(toPart(r));
    byNotice.set(r.notice_id, list);
  }
  return byNotice;
}

async function viewsFor(rows: NoticeRow[], db: Db, now = new Date()): Promise<NoticeView[]> {
  const parts = await partsFor(
    rows.map((r) => r.id),
    db,
  );
  return rows.map((r) => toView(r, parts.get(r.id) ?? [], now));
}

/** One notice with its parts, linked aids and reports; null when there is none. */
export async function getNotice(id: number, db: Db = defaultDb, now = new Date()): Promise<NoticeView | null> {
  if (!Number.isSafeInteger(id) || id <= 0) return null;
  const row = (await baseSelect(db).where("n.id", id).first()) as NoticeRow | undefined;
  if (!row) return null;
  const [parts, aids, reports] = await Promise.all([
    partsFor([id], db),
    db("notice_aids as na").join("aids as a", "a.id", "na.aid_id").where("na.notice_id", id).select("a.id", "a.code", "a.name").orderBy("a.code"),
    db("notice_reports").where({ notice_id: id }).select("report_id").orderBy("report_id"),
  ]);
  return toView(row, parts.get(id) ?? [], now, {
    aids: aids as NoticeView["aids"],
    reportIds: (reports as { report_id: number }[]).map((r) => r.report_id),
  });
}

// ---------------------------------------------------------------------------------------------
// Listing

export type StatusFilter = "in_force" | "expired" | "cancelled" | "superseded" | "draft" | "published" | "all";
export const SORT_KEYS = ["number", "published", "validFrom", "validUntil", "urgency", "type", "title", "updated"] as const;
export type SortKey = (typeof SORT_KEYS)[number];

export type NoticeFilter = {
  harbourId?: number;
  status?: StatusFilter;
  generalTypes?: string[];
  urgency?: "urgent" | "routine";
  q?: string;
  bbox?: [number, number, number, number];
  /** Published at or after. */
  since?: Date;
  /** Changed at or after (any change: amendment, cancellation, expiry). */
  updatedSince?: Date;
  /** Include drafts (staff lists only). */
  includeDrafts?: boolean;
  /** Internal: ids found by the bbox step (see noticeIdsInBbox). */
  bboxIds?: number[];
};

/**
 * Step one of a bbox search: the ids of notices matching the filter with a part whose MBR
 * intersects the box (MBRIntersects, which the SPATIAL index of notice_parts.geom serves; in
 * MariaDB only MBR* and ST_Intersects use it — the optimizer takes it when the box is the
 * selective part). A statement of its own without ORDER BY/LIMIT: MariaDB 10.11.18 fails the
 * predicate inside `id IN (subquery)`, EXISTS or a joined derived table once the plan scans
 * notices in id order for ORDER BY … LIMIT (error 1207 "Update locks cannot be acquired during
 * a READ UNCOMMITTED transaction", reproduced here).
 */
export function bboxIdsQuery(f: NoticeFilter & { bbox: [number, number, number, number]; afterId?: number }, db: Db = defaultDb, now = new Date()) {
  const q = db("notice_parts as p").join("notices as n", "n.id", "p.notice_id").select("p.notice_id").whereRaw("MBRIntersects(p.geom, ST_GeomFromText(?, 4326))", [bboxWkt(f.bbox)]);
  applyFilter(q, { ...f, bbox: undefined, status: f.status ?? "in_force" }, now, db);
  if (f.afterId) q.where("n.id", ">", f.afterId);
  return q;
}

export async function noticeIdsInBbox(f: NoticeFilter & { bbox: [number, number, number, number]; afterId?: number }, db: Db = defaultDb, now = new Date()): Promise<number[]> {
  const rows = (await bboxIdsQuery(f, db, now)) as { notice_id: number }[];
  return [...new Set(rows.map((r) => r.notice_id))];
}

/** The bbox as a WGS 84 polygon WKT (X = longitude). */
export function bboxWkt([minLon, minLat, maxLon, maxLat]: [number, number, number, number]): string {
  return `POLYGON((${minLon} ${minLat},${maxLon} ${minLat},${maxLon} ${maxLat},${minLon} ${maxLat},${minLon} ${minLat}))`;
}

function applyFilter(q: Knex.QueryBuilder, f: NoticeFilter, now: Date, db: Db) {
  if (f.harbourId) q.where("n.harbour_id", f.harbourId);
  const status = f.status ?? "in_force";
  const live = (b: Knex.QueryBuilder) => b.whereNull("n.valid_until").orWhere("n.valid_until", ">", now);
  switch (status) {
    case "in_force":
      q.where("n.status", "in_force").where(live);
      break;
    case "expired":
      q.where((b) => b.where("n.status", "expired").orWhere((c) => c.where("n.status", "in_force").where("n.valid_until", "<=", now)));
      break;
    case "cancelled":
    case "superseded":
    case "draft":
      q.where("n.status", status);
      break;
    case "published":
      q.whereNot("n.status", "draft");
      break;
    case "all":
      if (!f.includeDrafts) q.whereNot("n.status", "draft");
      break;
  }
  if (f.generalTypes?.length) q.whereIn("n.general_type", f.generalTypes);
  if (f.urgency) q.where("n.urgency", f.urgency);
  if (f.since) q.where("n.published_at", ">=", f.since);
  if (f.updatedSince) q.where("n.updated_at", ">=", f.updatedSince);
  if (f.q) {
    const like = `%${f.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    const m = /^\s*(?:[A-Z]{2,10}\s+)?(\d{4})\s*\/\s*(\d{1,4})\s*$/i.exec(f.q);
    q.where((b) => {
      b.where("n.title", "like", like).orWhere("n.body", "like", like).orWhere("n.locality", "like", like);
      if (m) b.orWhere((c) => c.where("n.year", Number(m[1])).where("n.number", Number(m[2])));
    });
  }
  if (f.bboxIds) q.whereIn("n.id", f.bboxIds.length ? f.bboxIds : [0]);
  return q;
}

const SORT_COLUMNS: Record<SortKey, string[]> = {
  number: ["n.year", "n.number"],
  published: ["n.published_at"],
  validFrom: ["n.valid_from"],
  validUntil: ["n.valid_until"],
  urgency: ["n.urgency"],
  type: ["n.general_type"],
  title: ["n.title"],
  updated: ["n.updated_at"],
};

/** A page of notices for the public list and the staff list (offset pages, sortable). */
export async function listNotices(
  f: NoticeFilter & { sort?: SortKey; dir?: "asc" | "desc"; page?: number; perPage?: number },
  db: Db = defaultDb,
  now = new Date(),
): Promise<{ notices: NoticeView[]; total: number; page: number; pages: number; lastModified: Date | null }> {
  const perPage = Math.min(Math.max(f.perPage ?? 25, 1), 200);
  const countRow = (await applyFilter(db("notices as n"), f, now, db)
    .count({ c: "*" })
    .max({ m: "n.updated_at" })
    .first()) as { c: number | string; m: Date | null };
  const total = Number(countRow.c);
  const pages = Math.max(1, Math.ceil(total / perPage));
  const page = Math.min(Math.max(f.page ?? 1, 1), pages);
  const q = applyFilter(baseSelect(db), f, now, db);
  const dir = f.dir ?? (f.sort === "title" || f.sort === "type" ? "asc" : "desc");
  // Urgent first, then the chosen order; urgency "urgent" < "routine" alphabetically.
  if (f.sort === "urgency") q.orderBy("n.urgency", dir === "desc" ? "asc" : "desc");
  else for (const col of SORT_COLUMNS[f.sort ?? "number"]) q.orderBy(col, dir);
  q.orderBy("n.id", dir);
  const rows = (await q.limit(perPage).offset((page - 1) * perPage)) as NoticeRow[];
  return { notices: await viewsFor(rows, db, now), total, page, pages, lastModified: countRow.m ? new Date(countRow.m) : null };
}

/** Every notice in force (board, bulletin), urgent first, then by number. */
export async function listInForce(harbourId?: number, db: Db = defaultDb, now = new Date(), opts: { withParts?: boolean } = {}): Promise<NoticeView[]> {
  const q = applyFilter(baseSelect(db), { harbourId, status: "in_force" }, now, db)
    .orderBy("n.urgency", "asc")
    .orderBy("n.year", "desc")
    .orderBy("n.number", "desc")
    .limit(1000);
  const rows = (await q) as NoticeRow[];
  // Lists that show no positions skip the parts (geometry) query: `parts` is then empty.
  return opts.withParts === false ? rows.map((r) => toView(r, [], now)) : viewsFor(rows, db, now);
}

/** Notices that ended (cancelled, superseded, expired) within the last `days`, newest first: the board shows them as ended. */
export async function listRecentlyEnded(harbourId: number | undefined, days = 14, db: Db = defaultDb, now = new Date(), opts: { withParts?: boolean } = {}): Promise<NoticeView[]> {
  const from = new Date(now.getTime() - days * 86_400_000);
  const q = baseSelect(db)
    .where((b) =>
      b
        .where((c) => c.whereIn("n.status", ["cancelled", "superseded"]).where("n.cancelled_at", ">=", from))
        .orWhere((c) => c.where("n.status", "expired").where("n.expired_at", ">=", from))
        .orWhere((c) => c.where("n.status", "in_force").whereNotNull("n.valid_until").where("n.valid_until", "<=", now).where("n.valid_until", ">=", from)),
    )
    .orderBy("n.updated_at", "desc")
    .limit(20);
  if (harbourId) q.where("n.harbour_id", harbourId);
  const rows = (await q) as NoticeRow[];
  return opts.withParts === false ? rows.map((r) => toView(r, [], now)) : viewsFor(rows, db, now);
}

/** The main statement of an API page (after the bbox step); the benchmark's baseline runs the same SQL. */
export function apiQuery(f: NoticeFilter & { afterId?: number; limit: number }, db: Db = defaultDb, now = new Date()) {
  // The bbox itself is applied by the bbox step (bboxIdsQuery → bboxIds), never here.
  if (f.bbox && !f.bboxIds) throw new Error("apiQuery: run bboxIdsQuery()/noticeIdsInBbox() for the bbox first and pass the ids as bboxIds");
  const q = applyFilter(baseSelect(db), { ...f, bbox: undefined, status: f.status ?? "in_force" }, now, db);
  if (f.afterId) q.where("n.id", ">", f.afterId);
  return q.orderBy("n.id", "asc").limit(f.limit + 1);
}

/** A cursor page for the API: ordered by id; `nextAfterId` when more follow. */
export async function listNoticesForApi(
  f: NoticeFilter & { afterId?: number; limit: number },
  db: Db = defaultDb,
  now = new Date(),
): Promise<{ notices: NoticeView[]; nextAfterId: number | null }> {
  const bboxIds = f.bbox ? await noticeIdsInBbox({ ...f, bbox: f.bbox }, db, now) : undefined;
  if (bboxIds && bboxIds.length === 0) return { notices: [], nextAfterId: null };
  const rows = (await apiQuery({ ...f, bboxIds }, db, now)) as NoticeRow[];
  const more = rows.length > f.limit;
  const page = more ? rows.slice(0, f.limit) : rows;
  return { notices: await viewsFor(page, db, now), nextAfterId: more ? page[page.length - 1]!.id : null };
}

/** The newest change to any published notice (Last-Modified of public lists and feeds). */
export async function lastPublicChange(db: Db = defaultDb): Promise<Date | null> {
  const row = (await db("notices").whereNot("status", "draft").max({ m: "updated_at" }).first()) as { m: Date | null } | undefined;
  return row?.m ? new Date(row.m) : null;
}

// ---------------------------------------------------------------------------------------------
// Audit trail

export type AuditEntry = {
  id: number;
  noticeId: number;
  actorUserId: number | null;
  actorName: string | null;
  action: string;
  version: number;
  changes: Record<string, [unknown, unknown]>;
  snapshot: NoticeView;
  reason: string | null;
  at: string;
};

const AUDIT_IGNORED = new Set(["updatedAt", "version", "effectiveStatus", "createdAt"]);

function diff(before: NoticeView | null, after: NoticeView): Record<string, [unknown, unknown]> {
  const out: Record<string, [unknown, unknown]> = {};
  for (const key of Object.keys(after) as (keyof NoticeView)[]) {
    if (AUDIT_IGNORED.has(key)) continue;
    const a = before ? before[key] : undefined;
    const b = after[key];
    const strip = (v: unknown) => (key === "parts" ? (v as NoticePart[] | undefined)?.map(({ id: _id, geometry: _g, ...rest }) => rest) : v);
    if (JSON.stringify(strip(a)) !== JSON.stringify(strip(b))) out[key] = [strip(a) ?? null, strip(b) ?? null];
  }
  return out;
}

async function audit(
  trx: Knex.Transaction,
  noticeId: number,
  actor: Actor,
  action: string,
  before: NoticeView | null,
  at: Date,
  reason?: string | null,
): Promise<NoticeView> {
  const after = (await getNotice(noticeId, trx, at))!;
  await trx("notice_audit").insert({
    notice_id: noticeId,
    actor_user_id: actor?.id ?? null,
    action,
    version: after.version,
    changes: JSON.stringify(diff(before, after)),
    snapshot: JSON.stringify(after),
    reason: reason ?? null,
    at,
  });
  return after;
}

export async function listAudit(noticeId: number, db: Db = defaultDb): Promise<AuditEntry[]> {
  const rows = (await db("notice_audit as a")
    .leftJoin("users as u", "u.id", "a.actor_user_id")
    .where("a.notice_id", noticeId)
    .orderBy("a.id", "asc")
    .select("a.*", "u.name as actor_name")) as {
    id: number;
    notice_id: number;
    actor_user_id: number | null;
    actor_name: string | null;
    action: string;
    version: number;
    changes: string;
    snapshot: string;
    reason: string | null;
    at: Date;
  }[];
  return rows.map((r) => ({
    id: Number(r.id),
    noticeId: r.notice_id,
    actorUserId: r.actor_user_id,
    actorName: r.actor_name,
    action: r.action,
    version: r.version,
    changes: JSON.parse(r.changes),
    snapshot: JSON.parse(r.snapshot),
    reason: r.reason,
    at: new Date(r.at).toISOString(),
  }));
}

export type FeedEntry = { auditId: number; action: string; at: string; reason: string | null; notice: NoticeView };

/** Public changes for the Atom feed: publications, amendments, cancellations, supersessions, expiries. */
export async function listPublicEvents(limit = 50, db: Db = defaultDb): Promise<FeedEntry[]> {
  const rows = (await db("notice_audit")
    .whereIn("action", ["published", "amended", "cancelled", "superseded", "expired"])
    .orderBy("id", "desc")
    .limit(limit)
    .select("id", "action", "at", "reason", "snapshot")) as { id: number; action: string; at: Date; reason: string | null; snapshot: string }[];
  return rows.map((r) => ({ auditId: Number(r.id), action: r.action, at: new Date(r.at).toISOString(), reason: r.reason, notice: JSON.parse(r.snapshot) }));
}

// ---------------------------------------------------------------------------------------------
// Writes

const DEADLOCK_CODES = new Set(["ER_LOCK_DEADLOCK", "ER_LOCK_WAIT_TIMEOUT"]);

/** A transaction retried when InnoDB picks it as a deadlock victim (its work is rolled back). */
async function inTransaction<T>(db: Db, fn: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await db.transaction(fn);
    } catch (e) {
      const code = (e as { code?: string }).code;
      if (!code || !DEADLOCK_CODES.has(code) || attempt >= 5) throw e;
      await new Promise((r) => setTimeout(r, 5 * attempt));
    }
  }
}

function noticeColumns(input: NoticeInput) {
  return {
    title: input.title,
    general_type: input.generalType,
    detail_types: JSON.stringify(input.detailTypes),
    restrictions: JSON.stringify(input.restrictions),
    urgency: input.urgency,
    position_status: input.positionStatus,
    valid_from: input.validFrom,
    valid_until: input.validUntil,
    general_area: input.generalArea,
    locality: input.locality,
    charts: input.charts,
    body: input.body,
    related_refs: input.relatedRefs,
    outside_boundary_accepted: input.acceptOutside,
  };
}

async function writeParts(trx: Knex.Transaction, noticeId: number, parts: ParsedPart[]) {
  await trx("notice_parts").where({ notice_id: noticeId }).delete();
  if (parts.length === 0) return;
  await trx("notice_parts").insert(
    parts.map((p, i) => ({
      notice_id: noticeId,
      seq: i + 1,
      kind: p.kind,
      positions_text: p.positionsText,
      crs: p.crs,
      radius_nm: p.radiusNm,
      coordinates_json: JSON.stringify(p.coordinates),
      geom: trx.raw("ST_GeomFromText(?, 4326)", [toWkt(p.geometry)]),
    })),
  );
}

async function writeLinks(trx: Knex.Transaction, noticeId: number, input: NoticeInput) {
  await trx("notice_aids").where({ notice_id: noticeId }).delete();
  if (input.aidIds.length) {
    const found = (await trx("aids").whereIn("id", input.aidIds).pluck("id")) as number[];
    const missing = input.aidIds.filter((id) => !found.includes(id));
    if (missing.length) throw new NoticeError(`No aid with id ${missing.join(", ")} in the register`, "aidIds");
    await trx("notice_aids").insert([...new Set(input.aidIds)].map((aid_id) => ({ notice_id: noticeId, aid_id })));
  }
  await trx("notice_reports").where({ notice_id: noticeId }).delete();
  if (input.reportIds.length) {
    await trx("notice_reports").insert([...new Set(input.reportIds)].map((report_id) => ({ notice_id: noticeId, report_id })));
  }
}

/** Does every part lie inside the harbour boundary? (Outside is a warning the officer may accept.) */
export async function partsOutsideBoundary(harbourId: number, parts: Pick<ParsedPart, "geometry">[], db: Db = defaultDb): Promise<boolean> {
  if (parts.length === 0) return false;
  return !(await withinBoundary(
    harbourId,
    parts.map((p) => toWkt(p.geometry)),
    db,
  ));
}

export const OUTSIDE_WARNING =
  "Part of this geometry lies outside the harbour's boundary. Check the positions and datum; if they are right, tick the box to accept.";

async function lockNotice(trx: Knex.Transaction, id: number, expectedVersion: number | null): Promise<NoticeRow> {
  const row = (await trx("notices").where({ id }).forUpdate().first()) as NoticeRow | undefined;
  if (!row) throw new NoticeError("There is no such notice.", "form", 404);
  if (expectedVersion !== null && row.version !== expectedVersion) {
    throw new NoticeError(
      `Someone else changed this notice while you were working on it (you had version ${expectedVersion}, it is now version ${row.version}). Your text is kept below: open the notice in a new tab to see their change, then save again.`,
      "version",
      409,
    );
  }
  return row;
}

async function checkBoundary(trx: Knex.Transaction, harbourId: number, parts: ParsedPart[], accepted: boolean) {
  if (!accepted && (await partsOutsideBoundary(harbourId, parts, trx))) throw new NoticeError(OUTSIDE_WARNING, "acceptOutside", 400);
}

/** Create a draft (officer or harbourmaster). */
export async function createDraft(
  harbourId: number,
  input: NoticeInput,
  actor: Actor,
  opts: { supersedesNoticeId?: number; at?: Date } = {},
  db: Db = defaultDb,
): Promise<NoticeView> {
  const at = opts.at ?? new Date();
  return inTransaction(db, async (trx) => {
    await checkBoundary(trx, harbourId, input.parts, input.acceptOutside);
    const [id] = await trx("notices").insert({
      harbour_id: harbourId,
      ...noticeColumns(input),
      supersedes_notice_id: opts.supersedesNoticeId ?? null,
      status: "draft",
      created_by: actor?.id ?? null,
      updated_by: actor?.id ?? null,
      created_at: at,
      updated_at: at,
    });
    await writeParts(trx, id!, input.parts);
    await writeLinks(trx, id!, input);
    return audit(trx, id!, actor, "created", null, at);
  });
}

/**
 * Save changes. A draft is edited (officer or harbourmaster); a notice in force is amended
 * (harbourmaster only): it keeps its number, the audit trail keeps every version, and
 * subscribers hear of the amendment.
 */
export async function updateNotice(id: number, expectedVersion: number, input: NoticeInput, actor: Actor, opts: { at?: Date } = {}, db: Db = defaultDb): Promise<NoticeView> {
  const at = opts.at ?? new Date();
  return inTransaction(db, async (trx) => {
    const row = await lockNotice(trx, id, expectedVersion);
    const status = effectiveStatus(row, at);
    if (status !== "draft" && status !== "in_force") {
      throw new NoticeError(`This notice is ${status.replace("_", " ")} and can no longer be changed. Publish a new notice instead.`, "form", 409);
    }
    const amending = status === "in_force";
    if (amending && actor?.role !== "harbourmaster") throw new NoticeError("Only the harbourmaster can amend a published notice.", "form", 403);
    const before = (await getNotice(id, trx, at))!;
    // Saving an unchanged form (e.g. "Save and publish" on a colleague's draft) is not a change:
    // no new version, no audit row, no amendment event.
    if (sameContent(before, input)) return before;
    await checkBoundary(trx, row.harbour_id, input.parts, input.acceptOutside);
    await trx("notices")
      .where({ id })
      .update({ ...noticeColumns(input), updated_by: actor?.id ?? null, updated_at: at, version: row.version + 1 });
    await writeParts(trx, id, input.parts);
    await writeLinks(trx, id, input);
    const after = await audit(trx, id, actor, amending ? "amended" : "edited", before, at);
    if (amending) await onNoticeEvent(trx, { kind: "amended", noticeId: id });
    return after;
  });
}

/** Does the submitted form say exactly what the notice already says? */
function sameContent(n: NoticeView, input: NoticeInput): boolean {
  const ms = (d: Date | string | null) => (d ? new Date(d).getTime() : null);
  const a = {
    title: n.title,
    generalType: n.generalType,
    detailTypes: [...n.detailTypes].sort(),
    restrictions: [...n.restrictions].sort(),
    urgency: n.urgency,
    positionStatus: n.positionStatus,
    validFrom: ms(n.validFrom),
    validUntil: ms(n.validUntil),
    generalArea: n.generalArea,
    locality: n.locality,
    charts: n.charts,
    body: n.body,
    relatedRefs: n.relatedRefs,
    acceptOutside: n.outsideBoundaryAccepted,
    aidIds: n.aids.map((x) => x.id).sort(),
    reportIds: [...n.reportIds].sort(),
    parts: n.parts.map((p) => [p.kind, p.crs, p.positionsText, p.radiusNm]),
  };
  const b = {
    title: input.title,
    generalType: input.generalType,
    detailTypes: [...input.detailTypes].sort(),
    restrictions: [...input.restrictions].sort(),
    urgency: input.urgency,
    positionStatus: input.positionStatus,
    validFrom: ms(input.validFrom),
    validUntil: ms(input.validUntil),
    generalArea: input.generalArea,
    locality: input.locality,
    charts: input.charts,
    body: input.body,
    relatedRefs: input.relatedRefs,
    acceptOutside: input.acceptOutside,
    aidIds: [...new Set(input.aidIds)].sort(),
    reportIds: [...new Set(input.reportIds)].sort(),
    parts: input.parts.map((p) => [p.kind, p.crs, p.positionsText, p.radiusNm]),
  };
  return JSON.stringify(a) === JSON.stringify(b);
}

async function nextNumber(trx: Knex.Transaction, harbourId: number, year: number): Promise<number> {
  // Make sure the counter row exists (a no-op update takes the row's exclusive lock at once, so
  // two first publishers of a year never both hold a shared lock and deadlock), then lock it.
  await trx.raw(
    "INSERT INTO notice_number_counters (harbour_id, year, last_number) VALUES (?, ?, 0) ON DUPLICATE KEY UPDATE last_number = last_number",
    [harbourId, year],
  );
  const counter = (await trx("notice_number_counters").where({ harbour_id: harbourId, year }).forUpdate().first()) as { last_number: number };
  const next = counter.last_number + 1;
  await trx("notice_number_counters").where({ harbour_id: harbourId, year }).update({ last_number: next });
  return next;
}

function yearIn(zone: string, at: Date): number {
  const y = new Intl.DateTimeFormat("en-GB", { timeZone: zone, year: "numeric" }).format(at);
  return Number(y);
}

async function event(trx: Knex.Transaction, kind: NoticeEventKind, noticeId: number) {
  await onNoticeEvent(trx, { kind, noticeId });
}

/**
 * Publish a draft (harbourmaster): assigns the next number of the harbour's series for the
 * year (in the harbour's time zone) and the publication time. A superseding draft cancels the
 * notice it supersedes in the same transaction.
 */
export async function publishNotice(
  id: number,
  expectedVersion: number,
  actor: Actor,
  opts: { acceptOutside?: boolean; at?: Date } = {},
  db: Db = defaultDb,
): Promise<NoticeView> {
  if (actor?.role !== "harbourmaster") throw new NoticeError("Only the harbourmaster can publish notices.", "form", 403);
  const at = opts.at ?? new Date();
  return inTransaction(db, async (trx) => {
    const row = await lockNotice(trx, id, expectedVersion);
    if (row.status !== "draft") throw new NoticeError("This notice has already been published.", "form", 409);
    const before = (await getNotice(id, trx, at))!;
    if (before.parts.length === 0) throw new NoticeError("Give the notice at least one position before publishing.", "parts.0.positions");
    if (row.valid_until && new Date(row.valid_until).getTime() <= at.getTime()) {
      throw new NoticeError("The notice's end is already past: change the end before publishing.", "validUntil");
    }
    const accepted = !!opts.acceptOutside || !!row.outside_boundary_accepted;
    if (!accepted && (await partsOutsideBoundary(row.harbour_id, before.parts, trx))) throw new NoticeError(OUTSIDE_WARNING, "acceptOutside");

    let superseded: NoticeRow | null = null;
    if (row.supersedes_notice_id) {
      superseded = (await trx("notices").where({ id: row.supersedes_notice_id }).forUpdate().first()) as NoticeRow;
      if (!superseded || effectiveStatus(superseded, at) !== "in_force") {
        throw new NoticeError("The notice this one supersedes is no longer in force; remove the reference or publish it as a new notice.", "form", 409);
      }
    }
    const harbour = await getHarbourById(row.harbour_id, trx);
    if (!harbour) throw new NoticeError("The notice's harbour no longer exists.", "form", 409);
    const year = yearIn(harbour.timeZone, at);
    const number = await nextNumber(trx, row.harbour_id, year);
    await trx("notices").where({ id }).update({
      status: "in_force",
      series_code: harbour.seriesCode,
      year,
      number,
      published_at: at,
      published_by: actor.id,
      outside_boundary_accepted: accepted,
      updated_by: actor.id,
      updated_at: at,
      version: row.version + 1,
    });
    if (superseded) {
      const beforeOld = (await getNotice(superseded.id, trx, at))!;
      await trx("notices").where({ id: superseded.id }).update({
        status: "superseded",
        superseded_by_notice_id: id,
        cancelled_at: at,
        cancellation_reason: `Superseded by ${formatSeriesNumber(harbour.seriesCode, year, number)}`,
        updated_by: actor.id,
        updated_at: at,
        version: superseded.version + 1,
      });
      await audit(trx, superseded.id, actor, "superseded", beforeOld, at, `Superseded by ${formatSeriesNumber(harbour.seriesCode, year, number)}`);
      await event(trx, "cancelled", superseded.id);
    }
    const after = await audit(trx, id, actor, "published", before, at);
    await event(trx, "published", id);
    return after;
  });
}

/** Cancel a notice in force, with a reason (harbourmaster). */
export async function cancelNotice(id: number, expectedVersion: number, reason: string, actor: Actor, opts: { at?: Date } = {}, db: Db = defaultDb): Promise<NoticeView> {
  if (actor?.role !== "harbourmaster") throw new NoticeError("Only the harbourmaster can cancel notices.", "form", 403);
  const why = reason.trim();
  if (why.length < 3) throw new NoticeError("Give the reason for the cancellation (it is published with it).", "reason");
  if (why.length > 1000) throw new NoticeError("At most 1000 characters.", "reason");
  const at = opts.at ?? new Date();
  return inTransaction(db, async (trx) => {
    const row = await lockNotice(trx, id, expectedVersion);
    const status = effectiveStatus(row, at);
    if (status !== "in_force") throw new NoticeError(`Only a notice in force can be cancelled; this one is ${status.replace("_", " ")}.`, "form", 409);
    const before = (await getNotice(id, trx, at))!;
    await trx("notices").where({ id }).update({
      status: "cancelled",
      cancellation_reason: why,
      cancelled_at: at,
      updated_by: actor.id,
      updated_at: at,
      version: row.version + 1,
    });
    const after = await audit(trx, id, actor, "cancelled", before, at, why);
    await event(trx, "cancelled", id);
    return after;
  });
}

/** Start a superseding notice: a draft copy of a notice in force that cancels it when published. */
export async function createSupersedingDraft(id: number, actor: Actor, opts: { at?: Date } = {}, db: Db = defaultDb): Promise<NoticeView> {
  if (actor?.role !== "harbourmaster") throw new NoticeError("Only the harbourmaster can supersede notices.", "form", 403);
  const at = opts.at ?? new Date();
  const old = await getNotice(id, db, at);
  if (!old) throw new NoticeError("There is no such notice.", "form", 404);
  if (old.effectiveStatus !== "in_force") throw new NoticeError("Only a notice in force can be superseded.", "form", 409);
  const existing = (await db("notices").where({ supersedes_notice_id: id, status: "draft" }).first("id")) as { id: number } | undefined;
  if (existing) return (await getNotice(existing.id, db, at))!;
  const input: NoticeInput = {
    title: old.title,
    generalType: old.generalType,
    detailTypes: old.detailTypes,
    restrictions: old.restrictions,
    urgency: old.urgency,
    positionStatus: old.positionStatus,
    validFrom: at,
    validUntil: old.validUntil ? new Date(old.validUntil) : null,
    generalArea: old.generalArea,
    locality: old.locality,
    charts: old.charts,
    body: old.body,
    relatedRefs: old.relatedRefs,
    aidIds: old.aids.map((a) => a.id),
    reportIds: old.reportIds,
    acceptOutside: old.outsideBoundaryAccepted,
    parts: old.parts.map((p) => ({ kind: p.kind, crs: p.crs, positionsText: p.positionsText, radiusNm: p.radiusNm, coordinates: p.coordinates, geometry: p.geometry })),
  };
  if (input.validUntil && input.validUntil.getTime() <= at.getTime()) input.validUntil = null;
  return createDraft(old.harbourId, input, actor, { supersedesNoticeId: id, at }, db);
}

/**
 * Expire every notice in force whose end has passed: one transaction per notice with its
 * audit row and event. Safe to run from several workers at once (SKIP LOCKED). Returns the
 * number expired.
 */
export async function expireDueNotices(at = new Date(), db: Db = defaultDb): Promise<number> {
  let count = 0;
  for (;;) {
    const done = await inTransaction(db, async (trx) => {
      const row = (await trx("notices")
        .where("status", "in_force")
        .whereNotNull("valid_until")
        .where("valid_until", "<=", at)
        .orderBy("valid_until")
        .orderBy("id")
        .forUpdate()
        .skipLocked()
        .first()) as NoticeRow | undefined;
      if (!row) return false;
      const before = (await getNotice(row.id, trx, at))!;
      await trx("notices").where({ id: row.id }).update({ status: "expired", expired_at: row.valid_until, updated_at: at, version: row.version + 1 });
      await audit(trx, row.id, null, "expired", before, at);
      await event(trx, "expired", row.id);
      return true;
    });
    if (!done) return count;
    count++;
  }
}

/** Re-check stored parts (used by the seed and tests): builds geometry the same way as the form. */
export function partFromEntered(kind: NoticePart["kind"], crs: string, positionsText: string, coordinates: LonLat[], radiusNm: number | null = null): ParsedPart {
  const r = buildPartGeometry(kind, coordinates, radiusNm);
  if (!r.ok) throw new Error(r.error);
  return { kind, crs, positionsText, radiusNm, coordinates: r.coordinates, geometry: r.geometry };
}
