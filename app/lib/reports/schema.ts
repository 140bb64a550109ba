/**
 * Discrepancy reports: the submission schema shared by the report form and POST /api/v1/reports,
 * the mapping from the flat form to it, the assessment input for one aid, and the EXIF checks.
 * Pure (zod, positions, geodesy): usable in the browser for the live preview.
 */
import { z } from "zod";
import { inverse } from "../geo/geodesy";
import { parsePosition } from "../geo/positions";

export const OBSERVATION_METHODS = ["gnss", "radar", "compass"] as const;
export type ObservationMethodName = (typeof OBSERVATION_METHODS)[number];
export const METHOD_LABELS: Record<ObservationMethodName, string> = {
  gnss: "Own GNSS position alongside the mark",
  radar: "Radar range and bearing from own position",
  compass: "Compass bearing and estimated distance",
};

/** Clock allowance for "not in the future" (a phone a little ahead of the server). */
export const FUTURE_ALLOWANCE_MS = 5 * 60_000;
/** Reports older than this are not accepted: memory and the mark have moved on. */
export const MAX_REPORT_AGE_DAYS = 90;

const text = (max: number, label: string) => z.string().trim().max(max, { error: `${label} can be at most ${max} characters` });

/** The observation, as in POST /api/v1/assessments (minus observedAt, which is the report's). */
const observationSchema = z.discriminatedUnion(
  "method",
  [
    z.object({ method: z.literal("gnss"), position: z.union([z.string(), z.object({ lat: z.number(), lon: z.number() })]) }).passthrough(),
    z.object({ method: z.literal("radar"), ownPosition: z.union([z.string(), z.object({ lat: z.number(), lon: z.number() })]) }).passthrough(),
    z.object({ method: z.literal("compass"), ownPosition: z.union([z.string(), z.object({ lat: z.number(), lon: z.number() })]) }).passthrough(),
  ],
  { error: 'observation.method must be "gnss", "radar" or "compass"' },
);

export const reportSubmissionSchema = z
  .object({
    aid: z.union([z.string().trim().min(1).max(30), z.number().int().positive()]).optional(),
    hazard: z.object({ description: text(500, "The hazard description").min(3, { error: "Describe the hazard in a few words" }) }).strict().optional(),
    observation: observationSchema,
    observedAt: z.iso.datetime({ offset: true, error: "observedAt must be an ISO 8601 date-time with a time zone, e.g. 2026-11-30T14:05:00Z" }),
    remarks: text(4000, "Remarks").optional(),
    reporter: z
      .object({
        email: z.email({ error: "Enter a valid e-mail address" }).max(254).optional(),
        name: text(120, "Your name").optional(),
        vessel: text(120, "The vessel name").optional(),
      })
      .strict()
      .optional(),
    photoUploadIds: z.array(z.uuid({ error: "photoUploadIds must be upload ids from POST /api/v1/uploads" })).max(6, { error: "At most 6 photos per report" }).optional(),
  })
  .strict()
  .superRefine((v, ctx) => {
    if (v.aid === undefined && !v.hazard) ctx.addIssue({ code: "custom", path: ["aid"], message: "Choose the aid you saw, or describe an uncharted hazard" });
    if (v.aid !== undefined && v.hazard) ctx.addIssue({ code: "custom", path: ["hazard"], message: "Report either an aid or an uncharted hazard, not both" });
    const t = Date.parse(v.observedAt);
    if (t > Date.now() + FUTURE_ALLOWANCE_MS) ctx.addIssue({ code: "custom", path: ["observedAt"], message: "The observation time is in the future: give the time you saw it" });
    else if (t < Date.now() - MAX_REPORT_AGE_DAYS * 86_400_000) ctx.addIssue({ code: "custom", path: ["observedAt"], message: `The observation is more than ${MAX_REPORT_AGE_DAYS} days old: call the harbour office instead` });
  });

export type ReportSubmission = z.infer<typeof reportSubmissionSchema>;

// ----------------------------------------------------------------------------------------------
// The form (flat fields; works without JavaScript) → a submission

/** Form field of each observation property, per method. */
export const FORM_FIELDS = {
  gnss: { position: "gnss.position" },
  radar: {
    ownPosition: "radar.ownPosition",
    rangeNm: "radar.rangeNm",
    bearingDeg: "radar.bearingDeg",
    bearingRef: "radar.bearingRef",
    headingTrueDeg: "radar.headingTrueDeg",
    rangeScaleNm: "radar.rangeScaleNm",
  },
  compass: { ownPosition: "compass.ownPosition", bearingMagneticDeg: "compass.bearingMagneticDeg", distanceM: "compass.distanceM" },
} as const;

const NUMERIC = new Set(["rangeNm", "bearingDeg", "headingTrueDeg", "rangeScaleNm", "bearingMagneticDeg", "distanceM"]);

/** A number from a form field ("" → undefined; "1,5" → 1.5; junk stays a string for a clear message). */
function formNumber(v: string | undefined): number | string | undefined {
  if (v === undefined || v.trim() === "") return undefined;
  const t = v.trim().replace(",", ".").replace(/[°º]$/, "");
  const n = Number(t);
  return Number.isFinite(n) ? n : v;
}

export interface ReportFormValues {
  target?: string; // "aid" | "hazard"
  aidId?: string;
  hazardDescription?: string;
  method?: string;
  observedAtIso?: string; // the form's local time already converted (server: luxon; browser: Date)
  remarks?: string;
  reporterEmail?: string;
  reporterName?: string;
  reporterVessel?: string;
  [field: string]: string | undefined;
}

/** Builds the API-shaped submission from the form's fields (only the chosen method's fields). */
export function submissionFromForm(f: ReportFormValues, uploadIds: string[]): Record<string, unknown> {
  const method = (OBSERVATION_METHODS as readonly string[]).includes(f.method ?? "") ? (f.method as ObservationMethodName) : undefined;
  const observation: Record<string, unknown> = { method: method ?? f.method ?? "" };
  if (method) {
    for (const [prop, field] of Object.entries(FORM_FIELDS[method])) {
      const raw = f[field];
      if (raw === undefined || raw.trim() === "") continue;
      observation[prop] = NUMERIC.has(prop) ? formNumber(raw) : raw.trim();
    }
    if (method === "radar" && observation.bearingRef === undefined) observation.bearingRef = "true";
    if (method === "radar" && observation.bearingRef === "true") delete observation.headingTrueDeg;
  }
  const out: Record<string, unknown> = { observation, observedAt: f.observedAtIso ?? "" };
  if (f.target === "hazard") out.hazard = { description: f.hazardDescription ?? "" };
  else if (f.aidId && /^\d+$/.test(f.aidId)) out.aid = Number(f.aidId);
  if (f.remarks?.trim()) out.remarks = f.remarks;
  const reporter: Record<string, string> = {};
  if (f.reporterEmail?.trim()) reporter.email = f.reporterEmail.trim();
  if (f.reporterName?.trim()) reporter.name = f.reporterName;
  if (f.reporterVessel?.trim()) reporter.vessel = f.reporterVessel;
  if (Object.keys(reporter).length) out.reporter = reporter;
  if (uploadIds.length) out.photoUploadIds = uploadIds;
  return out;
}

/** The form field that shows an error for an API field path (e.g. observation.rangeNm → radar.rangeNm). */
export function formFieldFor(apiPath: string, method: string | undefined): string {
  if (apiPath === "observedAt") return "observedAt";
  if (apiPath === "aid" || apiPath.startsWith("charted") || apiPath.startsWith("swingRadius") || apiPath.startsWith("mooring")) return "aidId";
  if (apiPath.startsWith("hazard")) return "hazardDescription";
  if (apiPath.startsWith("reporter.")) return "reporter" + apiPath.charAt(9).toUpperCase() + apiPath.slice(10);
  if (apiPath.startsWith("photoUploadIds")) return "photos";
  const m = /^observations?(?:\.\d+)?\.(\w+)/.exec(apiPath);
  if (m && method && method in FORM_FIELDS) {
    const prop = m[1]!;
    const fields = FORM_FIELDS[method as ObservationMethodName] as Record<string, string>;
    if (prop === "observedAt") return "observedAt";
    if (fields[prop]) return fields[prop];
  }
  if (apiPath.startsWith("observation")) return "method";
  return apiPath || "form";
}

// ----------------------------------------------------------------------------------------------
// Assessment input for one aid

export interface AidForAssessment {
  chartedPositionText: string;
  chartedCrs: string;
  chainLengthM: number | null;
  depthM: number | null;
  swingRadiusM: number | null;
}

/** The body of POST /api/v1/assessments for an aid and its observations (stated radius first). */
export function assessmentInputFor(aid: AidForAssessment, observations: Record<string, unknown>[]): Record<string, unknown> {
  const input: Record<string, unknown> = {
    charted: { position: aid.chartedPositionText, crs: aid.chartedCrs },
    observations,
  };
  if (aid.swingRadiusM !== null) input.swingRadiusM = aid.swingRadiusM;
  else if (aid.chainLengthM !== null && aid.depthM !== null) input.mooring = { chainLengthM: aid.chainLengthM, depthM: aid.depthM };
  else input.swingRadiusM = 0;
  return input;
}

/** An observation with the report's time attached, as the assessment wants it. */
export function observationWithTime(observation: Record<string, unknown>, observedAtIso: string): Record<string, unknown> {
  return { ...observation, observedAt: observedAtIso };
}

// ----------------------------------------------------------------------------------------------
// Photo EXIF against what was typed

/** A photo more than this far from the position given is flagged (our assumption: 1 km). */
export const EXIF_POSITION_TOLERANCE_M = 1000;
/** A photo taken more than this before or after the observation time is flagged (our assumption). */
export const EXIF_TIME_TOLERANCE_MS = 30 * 60_000;

export interface PhotoExif {
  lat: number | null;
  lon: number | null;
  takenAt: string | null;
}

/** The typed position an EXIF GPS fix should agree with: own position (radar/compass) or the GNSS position. */
export function typedOwnPosition(observation: Record<string, unknown>): { lat: number; lon: number } | null {
  const p = observation.method === "gnss" ? observation.position : observation.ownPosition;
  if (typeof p === "string") {
    const r = parsePosition(p);
    return r.ok ? { lat: r.lat, lon: r.lon } : null;
  }
  if (p && typeof p === "object" && "lat" in p) return p as { lat: number; lon: number };
  return null;
}

/** Mismatches between each photo's EXIF and the typed position and time, in words. */
export function photoMismatches(photos: PhotoExif[], own: { lat: number; lon: number } | null, observedAtIso: string | null): string[] {
  const flags: string[] = [];
  photos.forEach((p, i) => {
    const n = `Photo ${i + 1}`;
    if (own && p.lat !== null && p.lon !== null) {
      const d = inverse(own.lat, own.lon, p.lat, p.lon).distanceM;
      if (d > EXIF_POSITION_TOLERANCE_M) {
        flags.push(`${n} was taken ${d >= 10_000 ? Math.round(d / 1000) : (d / 1000).toFixed(1)} km from the own position given (its GPS tag).`);
      }
    }
    if (observedAtIso && p.takenAt) {
      const dt = Date.parse(p.takenAt) - Date.parse(observedAtIso);
      if (Math.abs(dt) > EXIF_TIME_TOLERANCE_MS) {
        const min = Math.round(Math.abs(dt) / 60_000);
        const span = min >= 120 ? `${Math.round(min / 60)} h` : `${min} min`;
        flags.push(`${n} was taken ${span} ${dt > 0 ? "after" : "before"} the observation time given (its EXIF time).`);
      }
    }
  });
  return flags;
}

// ----------------------------------------------------------------------------------------------
// Triage states

export const REPORT_STATUSES = ["new", "acknowledged", "confirmed", "not_confirmed", "duplicate", "closed"] as const;
export type ReportStatus = (typeof REPORT_STATUSES)[number];
export const REPORT_STATUS_LABELS: Record<ReportStatus, string> = {
  new: "New",
  acknowledged: "Acknowledged",
  confirmed: "Confirmed",
  not_confirmed: "Not confirmed",
  duplicate: "Duplicate",
  closed: "Closed",
};

/** new → acknowledged → confirmed / not confirmed / duplicate → closed (by a notice or no action). */
export const TRANSITIONS: Record<ReportStatus, readonly ReportStatus[]> = {
  new: ["acknowledged", "confirmed", "not_confirmed", "duplicate"],
  acknowledged: ["confirmed", "not_confirmed", "duplicate"],
  confirmed: ["closed"],
  not_confirmed: ["closed"],
  duplicate: ["closed"],
  closed: [],
};

export function canTransition(from: ReportStatus, to: ReportStatus): boolean {
  return TRANSITIONS[from].includes(to);
}

export const VERDICT_LABELS = {
  off_station: "Off station",
  inconclusive: "Inconclusive",
  within_swing_circle: "Within swing circle",
} as const;
