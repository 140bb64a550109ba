// GET /api/v1/notices: a GeoJSON FeatureCollection (RFC 7946) of notices, cursor-paginated.
import type { Route } from "./+types/api.v1.notices";
import { jsonError } from "~/lib/http";
import { encodeCursor, parseApiQuery } from "~/lib/notices/api-query";
import { noticeToFeature } from "~/lib/notices/geojson";
import { listNoticesForApi } from "~/models/notice.server";
import { publicRevision } from "~/models/public-revision.server";
import { validatedResource } from "~/services/http-cache.server";

export async function loader({ request }: Route.LoaderArgs) {
  // Public read: no guard beyond validation (drafts are never listed here).
  const url = new URL(request.url);
  const parsed = parseApiQuery(url.searchParams);
  if (!parsed.ok) return jsonError(parsed.error, parsed.field, 400, { "Cache-Control": "no-store" });
  const q = parsed.query;
  // Which notices are in force also moves with the clock (lapsedAt), not only with writes.
  const r = await publicRevision();
  return validatedResource(
    request,
    [r.notices, r.lapsedAt],
    async () => {
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
      let next: string | null = null;
      if (nextAfterId) {
        const n = new URL(url);
        n.searchParams.set("cursor", encodeCursor(nextAfterId));
        next = n.toString();
      }
      const body = {
        type: "FeatureCollection",
        features: notices.map((n) => noticeToFeature(n, { baseUrl: url.origin })),
        // Foreign members (RFC 7946 §6.1).
        numberReturned: notices.length,
        links: [{ rel: "self", href: url.toString() }, ...(next ? [{ rel: "next", href: next }] : [])],
      };
      const lastModified = notices.reduce<Date | null>((m, n) => (!m || new Date(n.updatedAt) > m ? new Date(n.updatedAt) : m), null);
      return { body: JSON.stringify(body), lastModified, headers: next ? { Link: `<${next}>; rel="next"` } : ({} as Record<string, string>) };
    },
    { contentType: "application/geo+json; charset=utf-8", maxAgeS: 10, headers: { "Access-Control-Allow-Origin": "*" } },
  );
}
