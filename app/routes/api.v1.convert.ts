// GET /api/v1/convert?from=EPSG:4277&to=EPSG:4326&position=<text>
// Converts a position between the supported CRSs (app/lib/geo). Numbers are unrounded; errors
// are { "error": "…", "field": "…" } with status 400.
import type { Route } from "./+types/api.v1.convert";
import { convertFromQuery } from "~/lib/geo/api";

const HEADERS = { "Access-Control-Allow-Origin": "*", "X-Content-Type-Options": "nosniff" };

export function loader({ request }: Route.LoaderArgs) {
  const r = convertFromQuery(new URL(request.url).searchParams);
  if (!r.ok) return Response.json({ error: r.error, field: r.field }, { status: 400, headers: { ...HEADERS, "Cache-Control": "no-store" } });
  return Response.json(r.value, { headers: { ...HEADERS, "Cache-Control": "public, max-age=86400" } });
}
