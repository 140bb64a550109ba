// One path for every report, from the browser form or POST /api/v1/reports: the same
// validation, the same answers. Order matters for "nothing half-saved": everything that can
// fail (validation, assessment, photo storage) is checked before the one transaction.
import { safeAssess, type AssessmentResponse } from "~/lib/geo/assessment";
import {
  assessmentInputFor,
  observationWithTime,
  photoMismatches,
  reportSubmissionSchema,
  typedOwnPosition,
} from "~/lib/reports/schema";
import { getAid, getAidByCode, type Aid } from "~/models/aid.server";
import type { Harbour } from "~/models/harbour.server";
import { UploadProblem, verifyUploadsStored } from "~/models/photo.server";
import { createReport, reportFollowUrl, reportReference } from "~/models/report.server";
import type { User } from "~/models/user.server";
import { exifTimeToIso } from "./photo-processing.server";
import { STORAGE_UNAVAILABLE_MESSAGE, StorageUnavailableError } from "./storage.server";

export type SubmitFailure = {
  ok: false;
  status: number;
  error: string;
  field: string;
  /** Every problem by API field path (the form shows each beside its field). */
  errors: Record<string, string>;
};
export type SubmitSuccess = {
  ok: true;
  reportId: number;
  reference: string;
  followUrl: string;
  assessment: AssessmentResponse | null;
  observed: { lat: number; lon: number; uncertaintyM: number };
  photoFlags: string[];
};

function fail(status: number, field: string, error: string, errors?: Record<string, string>): SubmitFailure {
  return { ok: false, status, field, error, errors: errors ?? { [field]: error } };
}

function zodErrors(issues: ReadonlyArray<{ path: PropertyKey[]; message: string; code?: string }>): Record<string, string> {
  const out: Record<string, string> = {};
  for (const i of issues) {
    const key = i.path.map(String).join(".") || "form";
    const msg = i.code === "invalid_type" && /received undefined/.test(i.message) ? `${key} is required` : i.message;
    out[key] ??= msg;
  }
  return out;
}

/** Map assessment error paths (observations.0.x) onto the report's (observation.x). */
function fromAssessmentPath(p: string): string {
  return p.replace(/^observations\.0\.?/, "observation.").replace(/\.$/, "");
}

export async function submitReport(raw: unknown, ctx: { user: User | null; harbour: Harbour }): Promise<SubmitSuccess | SubmitFailure> {
  const parsed = reportSubmissionSchema.safeParse(raw);
  if (!parsed.success) {
    const errors = zodErrors(parsed.error.issues);
    const [field, error] = Object.entries(errors)[0]!;
    return fail(400, field, error, errors);
  }
  const s = parsed.data;

  const reporterEmail = ctx.user?.email ?? s.reporter?.email;
  if (!reporterEmail) return fail(400, "reporter.email", "Give your e-mail address: we send a confirmation with a link to follow your report");

  let aid: Aid | null = null;
  if (s.aid !== undefined) {
    aid = typeof s.aid === "number" ? await getAid(s.aid) : await getAidByCode(ctx.harbour.id, s.aid);
    if (!aid || aid.harbourId !== ctx.harbour.id) return fail(400, "aid", `There is no aid ${s.aid} in the ${ctx.harbour.name} register`);
    if (aid.status === "withdrawn") return fail(400, "aid", `${aid.code} has been withdrawn from the register: report it as an uncharted hazard if you saw it`);
  }

  // The observation goes through the position engine: the same checks (impossible range,
  // bearing, positions, magnetic model dates) as POST /api/v1/assessments.
  const observation = observationWithTime(s.observation as Record<string, unknown>, s.observedAt);
  const input = aid
    ? assessmentInputFor(aid, [observation])
    : // An uncharted hazard has no charted position: assess against its own observation only
      // to get the observed position and its uncertainty.
      { charted: { position: { lat: 0, lon: 0 } }, swingRadiusM: 0, observations: [observation] };
  const result = safeAssess(input);
  if (!result.ok) {
    const field = fromAssessmentPath(result.field);
    if (!field.startsWith("observation")) {
      return fail(400, "aid", `The register entry for ${aid?.code ?? "this aid"} cannot be assessed (${result.error}); the harbour office has been told — send the report as an uncharted hazard meanwhile`);
    }
    return fail(400, field, result.error);
  }
  const assessment = aid ? result.value : null;
  const obs = result.value.observations[0]!;

  // Photos: present and really stored before anything is written.
  const ids = s.photoUploadIds ?? [];
  let uploads: Awaited<ReturnType<typeof verifyUploadsStored>> = [];
  try {
    uploads = await verifyUploadsStored(ids, ctx.user?.id ?? null);
  } catch (e) {
    if (e instanceof UploadProblem) return fail(e.status, "photoUploadIds", e.message);
    if (e instanceof StorageUnavailableError) return fail(503, "photos", STORAGE_UNAVAILABLE_MESSAGE);
    throw e;
  }
  const flags = photoMismatches(
    uploads.map((u) => {
      const m = /^(.{19})([+-]\d{2}:\d{2})?$/.exec(u.exif.takenAtRaw ?? "");
      return { lat: u.exif.lat, lon: u.exif.lon, takenAt: m ? exifTimeToIso(m[1]!, m[2] ?? null, ctx.harbour.timeZone) : null };
    }),
    typedOwnPosition(s.observation as Record<string, unknown>),
    s.observedAt,
  );

  const reportId = await createReport({
    harbourId: ctx.harbour.id,
    aidId: aid?.id ?? null,
    aidLabel: aid ? `${aid.code} ${aid.name.startsWith(aid.code) ? aid.name.slice(aid.code.length).trim() : aid.name}` : null,
    hazardDescription: s.hazard?.description ?? null,
    method: s.observation.method,
    observation,
    observedAt: new Date(s.observedAt),
    remarks: s.remarks?.trim() || null,
    reporterUserId: ctx.user?.id ?? null,
    reporterEmail,
    reporterName: s.reporter?.name?.trim() || ctx.user?.name || null,
    reporterVessel: s.reporter?.vessel?.trim() || null,
    observedLat: obs.lat,
    observedLon: obs.lon,
    uncertaintyM: obs.uncertaintyM,
    assessment,
    photoFlags: flags,
    photoUploadIds: uploads.map((u) => u.id),
  });
  return {
    ok: true,
    reportId,
    reference: reportReference(reportId),
    followUrl: reportFollowUrl(reportId),
    assessment,
    observed: { lat: obs.lat, lon: obs.lon, uncertaintyM: obs.uncertaintyM },
    photoFlags: flags,
  };
}


