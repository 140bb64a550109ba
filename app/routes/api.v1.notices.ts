// GET /api/v1/notices: a GeoJSON FeatureCollection (RFC 7946) of notices, cursor-paginated.
import type { Route } from "./+types/api.v1.notices";
import { jsonError } from "~/lib/http";
import { encodeCursor, parseApiQuery } from "~/lib/notices/api-query";
import { noticeToFeature } from "~/lib/notices/geojson";
import { listNoticesForApi } from "~/models/notice.server";
import { cachedResponse } from "~/services/http-cache.server";

export async function loader({ request }: Route.LoaderArgs) {
  // Public read: no guard beyond validation (drafts are never listed here).
  const url = new URL(request.url);
  const parsed = parseApiQuery(url.searchParams);
  if (!parsed.ok) return jsonError(parsed.error, parsed.field, 400, { "Cache-Control": "no-store" });
  const q = parsed.query;
  const { notices, nextAfterId } = await listNoticesForApi({
    bbox: q.bbox,
    status: q.status,
    generalTypes: q.type,
    urgency: q.urgency,
    since: q.since,
    updatedSince: q.updatedSince,
    afterId: q.cursor,
    limit: q.limit,
  });
  const base = url.origin;
  let next: string | null = null;
  if (nextAfterId) {
    const n = new URL(url);
    n.searchParams.set("cursor", encodeCursor(nextAfterId));
    next = n.toString();
  }
  const body = {
    type: "FeatureCollection",
    features: notices.map((n) => noticeToFeature(n, { baseUrl: base })),
    // Foreign members (RFC 7946 §6.1).
    numberReturned: notices.length,
    links: [{ rel: "self", href: url.toString() }, ...(next ? [{ rel: "next", href: next }] : [])],
  };
  const lastModified = notices.reduce<Date | null>((m, n) => (!m || new Date(n.updatedAt) > m ? new Date(n.updatedAt) : m), null);
  return cachedResponse(request, JSON.stringify(body), {
    contentType: "application/geo+json; charset=utf-8",
    lastModified,
    maxAgeS: 10,
    extraHeaders: { "Access-Control-Allow-Origin": "*", ...(next ? { Link: `<${next}>; rel="next"` } : {}) },
  });
}
