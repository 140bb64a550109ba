// POST /api/v1/assessments — displacement assessment of an aid to navigation from one or more
// observations (app/lib/geo/assessment.ts). Nothing is stored. The body is JSON; errors are
// { "error": "…", "field": "…" } with status 400 (413 for an oversized body, 405 for GET).
import type { Route } from "./+types/api.v1.assessments";
import { assessBody, readJsonBody } from "~/lib/geo/api";

const HEADERS = { "Cache-Control": "no-store", "X-Content-Type-Options": "nosniff" };

export function loader() {
  return Response.json(
    { error: "Use POST with a JSON body: see the API documentation", field: "" },
    { status: 405, headers: { ...HEADERS, Allow: "POST" } },
  );
}

export async function action({ request }: Route.ActionArgs) {
  if (request.method !== "POST") {
    return Response.json({ error: `${request.method} is not supported here: use POST`, field: "" }, { status: 405, headers: { ...HEADERS, Allow: "POST" } });
  }
  const body = await readJsonBody(request);
  if (!body.ok) return Response.json({ error: body.error, field: body.field }, { status: body.status ?? 400, headers: HEADERS });
  const r = assessBody(body.value);
  if (!r.ok) return Response.json({ error: r.error, field: r.field }, { status: 400, headers: HEADERS });
  return Response.json(r.value, { headers: HEADERS });
}
