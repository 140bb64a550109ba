// GET /api/v1/notices/:id: one notice as a GeoJSON Feature with every attribute.
import type { Route } from "./+types/api.v1.notices.id";
import { jsonError } from "~/lib/http";
import { noticeToFeature } from "~/lib/notices/geojson";
import { renderBroadcast } from "~/lib/notices/broadcast";
import { getNotice } from "~/models/notice.server";
import { cachedResponse } from "~/services/http-cache.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  if (!/^\d{1,10}$/.test(params.id)) return jsonError("id must be a notice number from the API (digits)", "id", 400);
  const notice = await getNotice(Number(params.id));
  // Drafts are not public.
  if (!notice || notice.status === "draft") return jsonError("There is no published notice with this id", "id", 404);
  const feature = noticeToFeature(notice, { baseUrl: new URL(request.url).origin, full: true });
  feature.properties.broadcastText = renderBroadcast(notice);
  return cachedResponse(request, JSON.stringify(feature), {
    contentType: "application/geo+json; charset=utf-8",
    lastModified: new Date(notice.updatedAt),
    maxAgeS: 10,
    extraHeaders: { "Access-Control-Allow-Origin": "*" },
  });
}
