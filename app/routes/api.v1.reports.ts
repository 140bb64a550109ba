// POST /api/v1/reports — a discrepancy report from a client other than the browser form, with
// the same validation and answers (see /work/notes/reports-docs.md for the body).
import type { Route } from "./+types/api.v1.reports";
import { jsonError } from "~/lib/http";
import { getDefaultHarbour } from "~/models/harbour.server";
import { getOptionalUser } from "~/services/auth.server";
import { enforceRateLimit } from "~/services/rate-limit.server";
import { submitReport } from "~/services/report-submit.server";

export async function loader() {
  return jsonError("Send a report with POST and a JSON body", undefined, 405, { Allow: "POST" });
}

export async function action({ request, context }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError("Use POST", undefined, 405, { Allow: "POST" });
  await enforceRateLimit("report", request, context);
  if (!(request.headers.get("Content-Type") ?? "").startsWith("application/json")) {
    return jsonError("Send the report as JSON (Content-Type: application/json)", "Content-Type", 415);
  }
  const body = await request.json().catch(() => undefined);
  if (body === undefined || typeof body !== "object" || body === null || Array.isArray(body)) return jsonError("The body must be a JSON object", "");
  const user = await getOptionalUser(request);
  const harbour = await getDefaultHarbour();
  if (!harbour) return jsonError("No harbour is set up yet", undefined, 503);
  const r = await submitReport(body, { user, harbour });
  if (!r.ok) return jsonError(r.error, r.field, r.status, r.status === 503 ? { "Retry-After": "30" } : undefined);
  return Response.json(
    {
      id: r.reportId,
      reference: r.reference,
      status: "new",
      followUrl: r.followUrl,
      observed: r.observed,
      assessment: r.assessment,
      photoFlags: r.photoFlags,
    },
    { status: 201, headers: { Location: `/reports/${r.reportId}`, "Cache-Control": "no-store" } },
  );
}
