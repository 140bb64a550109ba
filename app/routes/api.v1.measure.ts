// GET /api/v1/measure?from=<position>&to=<position> — distance and bearings on the WGS 84
// ellipsoid (geodesic). Numbers are unrounded; errors are { "error", "field" } with status 400.
import type { Route } from "./+types/api.v1.measure";
import { measureFromQuery } from "~/lib/geo/api";

const HEADERS = { "Access-Control-Allow-Origin": "*", "X-Content-Type-Options": "nosniff" };

export function loader({ request }: Route.LoaderArgs) {
  const r = measureFromQuery(new URL(request.url).searchParams);
  if (!r.ok) return Response.json({ error: r.error, field: r.field }, { status: 400, headers: { ...HEADERS, "Cache-Control": "no-store" } });
  return Response.json(r.value, { headers: { ...HEADERS, "Cache-Control": "public, max-age=86400" } });
}
