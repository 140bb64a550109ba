// GET /notices/:id/gpx: the notice's positions as GPX 1.1 (WGS 84).
import type { Route } from "./+types/notices.gpx";
import { renderGpx } from "~/lib/notices/gpx";
import { getNotice } from "~/models/notice.server";
import { cachedResponse } from "~/services/http-cache.server";
import { getOptionalUser } from "~/services/auth.server";
import { can } from "~/lib/permissions";

export async function loader({ request, params }: Route.LoaderArgs) {
  if (!/^\d{1,10}$/.test(params.id)) throw new Response("Not found", { status: 404 });
  const notice = await getNotice(Number(params.id));
  if (!notice) throw new Response("Not found", { status: 404 });
  if (notice.status === "draft") {
    // Drafts only for staff who may draft.
    const user = await getOptionalUser(request);
    if (!can(user?.role, "notice:draft")) throw new Response("Not found", { status: 404 });
  }
  const file = (notice.seriesNumber ?? `draft-${notice.id}`).replace(/[^A-Za-z0-9]+/g, "-");
  return cachedResponse(request, renderGpx(notice), {
    contentType: "application/gpx+xml; charset=utf-8",
    lastModified: new Date(notice.updatedAt),
    extraHeaders: { "Content-Disposition": `attachment; filename="${file}.gpx"` },
  });
}
