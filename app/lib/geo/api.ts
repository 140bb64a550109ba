/**
 * The three position-tool computations behind GET /api/v1/convert, GET /api/v1/measure and
 * POST /api/v1/assessments, as pure functions of their inputs (query parameters or a parsed
 * JSON body). Routes and the tools page's loader both call these, so the page without
 * JavaScript and the API give the same answers.
 */
import { safeAssess, type AssessmentResponse, CAUTION } from "./assessment";
import { conversionInfo, convert, type Coord, isGeographicCoord } from "./crs";
import { GeoInputError } from "./errors";
import { inverse } from "./geodesy";
import { formatAll } from "./positions";
import { convertQuerySchema, type FieldError, firstFieldError, measureQuerySchema } from "./schemas";

export type ApiResult<T> = { ok: true; value: T } | ({ ok: false } & FieldError);

export interface ConvertResponse {
  from: string;
  to: string;
  /** The source position as read (in the source CRS). */
  input: Coord;
  /** Decimal degrees for a geographic target, metres for a projected one. Unrounded. */
  result: { lat: number; lon: number } | { easting: number; northing: number };
  /** The result written out: DD, DDM, DMS and broadcast for geographic; "E … N …" for projected. */
  formatted: Record<string, string>;
  transformations: { id: string; name: string; accuracyM: number; method: string }[];
  /** Root sum of squares of the stated accuracies of the transformations used, metres. */
  accuracyM: number;
  caution: string;
}

export interface MeasureResponse {
  from: { lat: number; lon: number };
  to: { lat: number; lon: number };
  distanceM: number;
  distanceNm: number;
  distanceCables: number;
  initialBearingTrueDeg: number;
  finalBearingTrueDeg: number;
  caution: string;
}

type Query = URLSearchParams | Record<string, string | undefined>;

function pick(q: Query, keys: string[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const k of keys) {
    const v = q instanceof URLSearchParams ? q.get(k) : q[k];
    if (v !== null && v !== undefined) out[k] = v;
  }
  return out;
}

function guard<T>(f: () => ApiResult<T>): ApiResult<T> {
  try {
    return f();
  } catch (e) {
    if (e instanceof GeoInputError) return { ok: false, error: e.message, field: e.field };
    // Never a 500 for input: anything the engine cannot compute is reported as such.
    console.error("geo computation failed", e);
    return { ok: false, error: "This input cannot be computed", field: "" };
  }
}

export function grid(easting: number, northing: number): string {
  return `E ${easting.toFixed(2)} m  N ${northing.toFixed(2)} m`;
}

/** GET /api/v1/convert?from=EPSG:4277&to=EPSG:4326&position=… */
export function convertFromQuery(q: Query): ApiResult<ConvertResponse> {
  return guard(() => {
    const parsed = convertQuerySchema.safeParse(pick(q, ["from", "to", "position", "fromTransformation", "toTransformation"]));
    if (!parsed.success) return { ok: false, ...firstFieldError(parsed.error) };
    const v = parsed.data;
    const opts = { fromTransformation: v.fromTransformation.id, toTransformation: v.toTransformation.id };
    const out = convert(v.from, v.to, v.coord, opts);
    const info = conversionInfo(v.from, v.to, opts);
    const result = isGeographicCoord(out) ? { lat: out.lat, lon: out.lon } : { easting: out.easting, northing: out.northing };
    const formatted = isGeographicCoord(out) ? formatAll(out.lat, out.lon) : { grid: grid(out.easting, out.northing) };
    return {
      ok: true,
      value: { from: v.from.id, to: v.to.id, input: v.coord, result, formatted, transformations: info.transformations, accuracyM: info.accuracyM, caution: CAUTION },
    };
  });
}

/** GET /api/v1/measure?from=…&to=… (WGS 84 positions) */
export function measureFromQuery(q: Query): ApiResult<MeasureResponse> {
  return guard(() => {
    const parsed = measureQuerySchema.safeParse(pick(q, ["from", "to"]));
    if (!parsed.success) return { ok: false, ...firstFieldError(parsed.error) };
    const { from, to } = parsed.data;
    const r = inverse(from.lat, from.lon, to.lat, to.lon);
    return { ok: true, value: { from, to, ...r, caution: CAUTION } };
  });
}

/** POST /api/v1/assessments body (already JSON-parsed). */
export function assessBody(body: unknown): ApiResult<AssessmentResponse> {
  return guard(() => safeAssess(body));
}

/** Read a request body as JSON with a size limit; errors name no field (the whole body). */
export async function readJsonBody(request: Request, maxBytes = 64 * 1024): Promise<ApiResult<unknown> & { status?: number }> {
  const declared = Number(request.headers.get("Content-Length") ?? "0");
  if (declared > maxBytes) return { ok: false, error: `The body is larger than ${maxBytes / 1024} kB`, field: "", status: 413 };
  let text: string;
  try {
    text = await request.text();
  } catch {
    return { ok: false, error: "The body could not be read", field: "" };
  }
  if (text.length > maxBytes) return { ok: false, error: `The body is larger than ${maxBytes / 1024} kB`, field: "", status: 413 };
  if (text.trim() === "") return { ok: false, error: "Send a JSON body (Content-Type: application/json)", field: "" };
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch (e) {
    return { ok: false, error: `The body is not valid JSON: ${(e as Error).message}`, field: "" };
  }
}
