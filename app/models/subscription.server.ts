// Subscriptions: data access as small named functions; each takes an optional db/transaction.
import { db as defaultDb, type Db } from "~/db.server";
import { areaText, prefilterGeometry, type SubscriptionArea } from "~/lib/subscriptions/area";
import { bboxOfPoints, noticeBBox, subscriptionMatchesNotice, type BBox, type NoticePartShape, type NoticeShape } from "~/lib/subscriptions/matching";
import { nextDigestAt, type DigestCadence, type DigestSchedule } from "~/lib/subscriptions/schedule";
import type { DigestNotice } from "~/lib/subscriptions/digest";
import { formatSeriesNumber } from "~/lib/notices/vocabulary";

export type SubscriptionStatus = "pending" | "confirmed" | "ended";

export type Subscription = {
  id: number;
  email: string;
  userId: number | null;
  harbourId: number;
  area: SubscriptionArea;
  areaText: string | null;
  generalTypes: string[];
  urgentAlerts: boolean;
  digest: DigestSchedule;
  status: SubscriptionStatus;
  label: string | null;
  confirmedAt: Date | null;
  endedAt: Date | null;
  lastDigestAt: Date | null;
  nextDigestAt: Date | null;
  createdAt: Date;
};

export type SubscriptionInput = {
  email: string;
  userId?: number | null;
  harbourId: number;
  area: SubscriptionArea;
  generalTypes: string[];
  urgentAlerts: boolean;
  digest: DigestSchedule;
  label?: string | null;
};

export type HarbourForMail = { id: number; name: string; authorityName: string; timeZone: string; seriesCode: string; boundary: unknown };

/** Unconfirmed requests lapse after this long (the confirmation link expires with them). */
export const PENDING_LAPSE_MS = 72 * 3600_000;

type Row = Record<string, any>;

export function rowToSubscription(r: Row): Subscription {
  let area: SubscriptionArea;
  if (r.area_kind === "circle") area = { kind: "circle", centre: { lat: Number(r.centre_lat), lon: Number(r.centre_lon) }, radiusNm: Number(r.radius_nm) };
  else if (r.area_kind === "polygon") area = { kind: "polygon", ring: JSON.parse(r.area_geojson).coordinates[0] };
  else area = { kind: "harbour" };
  return {
    id: r.id,
    email: r.email,
    userId: r.user_id ?? null,
    harbourId: r.harbour_id,
    area,
    areaText: r.area_text ?? null,
    generalTypes: JSON.parse(r.general_types || "[]"),
    urgentAlerts: !!r.urgent_alerts,
    digest: { cadence: r.digest_cadence as DigestCadence, localTime: r.digest_local_time ?? null, weekday: r.digest_weekday ?? null },
    status: r.status,
    label: r.label ?? null,
    confirmedAt: r.confirmed_at ?? null,
    endedAt: r.ended_at ?? null,
    lastDigestAt: r.last_digest_at ?? null,
    nextDigestAt: r.next_digest_at ?? null,
    createdAt: r.created_at,
  };
}

// Only the columns the app reads (the geometry column stays in the database).
const COLUMNS = [
  "id", "email", "user_id", "harbour_id", "area_kind", "area_geojson", "centre_lat", "centre_lon", "radius_nm", "area_text",
  "general_types", "urgent_alerts", "digest_cadence", "digest_local_time", "digest_weekday", "status", "label",
  "confirmed_at", "ended_at", "last_digest_at", "next_digest_at", "created_at",
];

export async function getHarbourForMail(harbourId?: number, db: Db = defaultDb): Promise<HarbourForMail | null> {
  const q = db("harbours").select("id", "name", "authority_name", "time_zone", "series_code", db.raw("ST_AsGeoJSON(boundary) AS boundary_json"));
  const r = await (harbourId ? q.where({ id: harbourId }) : q.orderBy("id")).first();
  if (!r) return null;
  return { id: r.id, name: r.name, authorityName: r.authority_name, timeZone: r.time_zone, seriesCode: r.series_code, boundary: JSON.parse(r.boundary_json) };
}

function areaColumns(area: SubscriptionArea, harbour: HarbourForMail, db: Db) {
  return {
    area_kind: area.kind,
    area: db.raw("ST_GeomFromGeoJSON(?, 1, 4326)", [JSON.stringify(prefilterGeometry(area, harbour.boundary))]),
    area_geojson: area.kind === "polygon" ? JSON.stringify({ type: "Polygon", coordinates: [area.ring] }) : null,
    centre_lat: area.kind === "circle" ? area.centre.lat : null,
    centre_lon: area.kind === "circle" ? area.centre.lon : null,
    radius_nm: area.kind === "circle" ? area.radiusNm : null,
    area_text: areaText(area),
  };
}

function scheduleColumns(d: DigestSchedule) {
  return {
    digest_cadence: d.cadence,
    digest_local_time: d.cadence === "none" ? null : d.localTime,
    digest_weekday: d.cadence === "weekly" ? d.weekday : null,
  };
}

/** A new request awaiting confirmation (double opt-in). */
export async function createPendingSubscription(input: SubscriptionInput, harbour: HarbourForMail, db: Db = defaultDb): Promise<number> {
  const [id] = await db("subscriptions").insert({
    email: input.email,
    user_id: input.userId ?? null,
    harbour_id: input.harbourId,
    ...areaColumns(input.area, harbour, db),
    general_types: JSON.stringify(input.generalTypes),
    urgent_alerts: input.urgentAlerts,
    ...scheduleColumns(input.digest),
    label: input.label ?? null,
    status: "pending",
  });
  return id;
}

/** Inserts an already confirmed subscription (seeds, signed-in boaters whose address is verified, benches). */
export async function createConfirmedSubscription(input: SubscriptionInput, harbour: HarbourForMail, now = new Date(), db: Db = defaultDb): Promise<number> {
  const [id] = await db("subscriptions").insert({
    email: input.email,
    user_id: input.userId ?? null,
    harbour_id: input.harbourId,
    ...areaColumns(input.area, harbour, db),
    general_types: JSON.stringify(input.generalTypes),
    urgent_alerts: input.urgentAlerts,
    ...scheduleColumns(input.digest),
    label: input.label ?? null,
    status: "confirmed",
    confirmed_at: now,
    last_digest_at: now,
    next_digest_at: nextDigestAt(input.digest, harbour.timeZone, now),
  });
  return id;
}

export async function getSubscription(id: number, db: Db = defaultDb): Promise<Subscription | null> {
  const r = await db("subscriptions").select(COLUMNS).where({ id }).first();
  return r ? rowToSubscription(r) : null;
}

/** Pending → confirmed (only within the lapse period). Returns false if nothing changed. */
export async function confirmSubscription(id: number, timeZone: string, now = new Date(), db: Db = defaultDb): Promise<boolean> {
  const sub = await getSubscription(id, db);
  if (!sub) return false;
  if (sub.status === "confirmed") return true; // a second click on the same link is fine
  if (sub.status !== "pending" || now.getTime() - sub.createdAt.getTime() > PENDING_LAPSE_MS) return false;
  const n = await db("subscriptions")
    .where({ id, status: "pending" })
    .update({ status: "confirmed", confirmed_at: now, last_digest_at: now, next_digest_at: nextDigestAt(sub.digest, timeZone, now), updated_at: now });
  return n === 1;
}

export async function updateSubscription(
  id: number,
  input: Omit<SubscriptionInput, "email" | "userId" | "harbourId">,
  harbour: HarbourForMail,
  now = new Date(),
  db: Db = defaultDb,
): Promise<boolean> {
  const n = await db("subscriptions")
    .where({ id })
    .whereNot({ status: "ended" })
    .update({
      ...areaColumns(input.area, harbour, db),
      general_types: JSON.stringify(input.generalTypes),
      urgent_alerts: input.urgentAlerts,
      ...scheduleColumns(input.digest),
      next_digest_at: nextDigestAt(input.digest, harbour.timeZone, now),
      updated_at: now,
    });
  return n === 1;
}

export async function endSubscription(id: number, reason: "unsubscribed" | "lapsed", db: Db = defaultDb): Promise<boolean> {
  const now = new Date();
  const n = await db("subscriptions").where({ id }).whereNot({ status: "ended" }).update({ status: "ended", ended_at: now, ended_reason: reason, next_digest_at: null, updated_at: now });
  return n === 1;
}

/** Pending requests older than the lapse period end as "lapsed"; returns how many. */
export async function lapseUnconfirmed(now = new Date(), db: Db = defaultDb): Promise<number> {
  return db("subscriptions")
    .where({ status: "pending" })
    .where("created_at", "<", new Date(now.getTime() - PENDING_LAPSE_MS))
    .update({ status: "ended", ended_at: now, ended_reason: "lapsed", updated_at: now });
}

export async function listSubscriptionsForUser(user: { id: number; email: string }, db: Db = defaultDb): Promise<Subscription[]> {
  const rows = await db("subscriptions")
    .select(COLUMNS)
    .where((q) => q.where({ user_id: user.id }).orWhere({ email: user.email.toLowerCase() }))
    .whereNot({ status: "ended" })
    .orderBy("id");
  return rows.map(rowToSubscription);
}

/** Links a signed-in boater's address's subscriptions to the account (so they show up there). */
export async function claimSubscriptionsForUser(user: { id: number; email: string }, db: Db = defaultDb): Promise<void> {
  await db("subscriptions").where({ email: user.email.toLowerCase() }).whereNull("user_id").update({ user_id: user.id });
}

// ---------------------------------------------------------------------------------------------
// Notices as the mail side reads them (the notices and notice_parts tables).

export type NoticeForMail = NoticeShape &
  DigestNotice & {
    status: string;
    version: number;
    body: string;
    locality: string;
    validFrom: Date;
    cancellationReason: string | null;
    updatedAt: Date;
  };

export function seriesNumberOf(r: { series_code: string | null; year: number | null; number: number | null }): string | null {
  return r.series_code && r.year && r.number ? formatSeriesNumber(r.series_code, r.year, r.number) : null;
}

export async function loadNoticesForMail(ids: number[], db: Db = defaultDb): Promise<Map<number, NoticeForMail>> {
  const out = new Map<number, NoticeForMail>();
  if (ids.length === 0) return out;
  const rows = await db("notices")
    .select("id", "harbour_id", "series_code", "year", "number", "title", "general_type", "urgency", "status", "version", "body", "locality", "valid_from", "valid_until", "cancellation_reason", "updated_at")
    .whereIn("id", ids);
  const parts = await db("notice_parts").select("notice_id", "kind", "radius_nm", "coordinates_json").whereIn("notice_id", ids).orderBy(["notice_id", "seq"]);
  const partsBy = new Map<number, NoticePartShape[]>();
  for (const p of parts) {
    const list = partsBy.get(p.notice_id) ?? [];
    list.push({ kind: p.kind, coordinates: JSON.parse(p.coordinates_json), radiusNm: p.radius_nm === null ? null : Number(p.radius_nm) });
    partsBy.set(p.notice_id, list);
  }
  for (const r of rows) {
    out.set(r.id, {
      id: r.id,
      harbourId: r.harbour_id,
      seriesNumber: seriesNumberOf(r),
      title: r.title,
      generalType: r.general_type,
      urgency: r.urgency,
      status: r.status,
      version: r.version,
      body: r.body,
      locality: r.locality,
      validFrom: r.valid_from,
      validUntil: r.valid_until ?? null,
      cancellationReason: r.cancellation_reason ?? null,
      updatedAt: r.updated_at,
      parts: partsBy.get(r.id) ?? [],
    });
  }
  return out;
}

const bboxWkt = ([x0, y0, x1, y1]: BBox) => `POLYGON((${x0} ${y0},${x1} ${y0},${x1} ${y1},${x0} ${y1},${x0} ${y0}))`;

/**
 * Confirmed subscriptions that want urgent alerts and whose area touches the notice: the
 * SPATIAL index prefilters by bounding box (MBRIntersects), the exact test runs after it.
 */
export async function findAlertRecipients(notice: NoticeShape, db: Db = defaultDb): Promise<Subscription[]> {
  const base = () => db("subscriptions").select(COLUMNS).where({ status: "confirmed", urgent_alerts: true, harbour_id: notice.harbourId });
  // Whole-harbour subscriptions match every notice of the harbour (also one without positions).
  const rows: Row[] = await base().where({ area_kind: "harbour" });
  if (notice.parts.length > 0) {
    let box = noticeBBox(notice);
    if (box[0] === box[2] || box[1] === box[3]) box = bboxOfPoints([[box[0], box[1]], [box[2], box[3]]], 0.001);
    // A separate query (no OR), so MariaDB can use the SPATIAL index on `area` for the prefilter.
    rows.push(...(await base().whereNot({ area_kind: "harbour" }).whereRaw("MBRIntersects(area, ST_GeomFromText(?, 4326))", [bboxWkt(box)])));
  }
  return rows
    .sort((a, b) => a.id - b.id)
    .map(rowToSubscription)
    .filter((s) => subscriptionMatchesNotice(s, notice));
}

/** The prefilter's query plan (for tests and the staff view): does it use the SPATIAL index? */
export async function explainAlertPrefilter(box: BBox, db: Db = defaultDb): Promise<Row[]> {
  const [rows] = await db.raw("EXPLAIN SELECT id FROM subscriptions WHERE MBRIntersects(area, ST_GeomFromText(?, 4326)) AND status = 'confirmed'", [bboxWkt(box)]);
  return rows as Row[];
}

// ---------------------------------------------------------------------------------------------
// Staff overview

export async function subscriberCounts(db: Db = defaultDb) {
  const rows = await db("subscriptions").select("status", "area_kind", "digest_cadence", "urgent_alerts").count({ n: "*" }).groupBy("status", "area_kind", "digest_cadence", "urgent_alerts");
  return rows.map((r: Row) => ({ status: r.status as SubscriptionStatus, areaKind: r.area_kind as string, cadence: r.digest_cadence as DigestCadence, urgentAlerts: !!r.urgent_alerts, count: Number(r.n) }));
}

export async function listSubscriptionsForStaff(opts: { limit?: number; offset?: number; status?: SubscriptionStatus } = {}, db: Db = defaultDb) {
  const q = db("subscriptions").select(COLUMNS).orderBy("id", "desc").limit(opts.limit ?? 50).offset(opts.offset ?? 0);
  if (opts.status) q.where({ status: opts.status });
  return (await q).map(rowToSubscription);
}

/** The harbour's offline base map (GeoJSON) for the subscribe map, or null. */
export async function getHarbourBasemap(harbourId: number, db: Db = defaultDb): Promise<{ type: "FeatureCollection"; features: unknown[] } | null> {
  const r = await db("harbours").where({ id: harbourId }).first("basemap_geojson");
  try {
    return r?.basemap_geojson ? JSON.parse(r.basemap_geojson) : null;
  } catch {
    return null;
  }
}
