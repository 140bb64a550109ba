/**
 * The notice form (staff editor) and its validation, shared by the action and the API. Dates
 * are typed as local times in the harbour's time zone (`datetime-local` inputs) and stored in
 * UTC. Geometry parts arrive as parts.N.kind / parts.N.crs / parts.N.positions / parts.N.radiusNm.
 */
import { DateTime } from "luxon";
import { z } from "zod";
import { parseCrsCode } from "../geo/crs";
import { buildPartGeometry, parsePositionLines, type LonLat, type PartGeometry } from "./geometry";
import { DETAIL_CODES, GENERAL_TYPE_KEYS, PART_KINDS, RESTRICTION_CODES, type PartKind } from "./vocabulary";

export const MAX_PARTS = 8;

const text = (max: number, message: string) => z.string().trim().min(1, message).max(max, `At most ${max} characters`);
const optionalText = (max: number) => z.string().trim().max(max, `At most ${max} characters`).default("");
const codeList = (allowed: ReadonlySet<number>, what: string) =>
  z
    .union([z.string(), z.array(z.string())])
    .optional()
    .transform((v) => (v === undefined ? [] : Array.isArray(v) ? v : [v]).filter((s) => s !== ""))
    .pipe(z.array(z.string().regex(/^\d+$/, `Unknown ${what}`).transform(Number).refine((c) => allowed.has(c), { message: `Unknown ${what}` })).max(20));
const idList = z
  .union([z.string(), z.array(z.string())])
  .optional()
  .transform((v) => (v === undefined ? [] : Array.isArray(v) ? v : v.split(/[\s,]+/)).filter((s) => s.trim() !== ""))
  .pipe(z.array(z.string().trim().regex(/^[1-9]\d{0,9}$/, "Give id numbers").transform(Number)).max(50));
const checkbox = z
  .union([z.literal("on"), z.literal("true"), z.literal("1"), z.literal(""), z.literal("false"), z.literal("0")])
  .optional()
  .transform((v) => v === "on" || v === "true" || v === "1");

export const noticeFieldsSchema = z.object({
  title: text(160, "Give the notice a title (the key subject, e.g. “KS3 buoy off position”)"),
  generalType: z.enum(GENERAL_TYPE_KEYS, { message: "Choose a general type" }),
  detailTypes: codeList(DETAIL_CODES, "detail type"),
  restrictions: codeList(RESTRICTION_CODES, "restriction"),
  urgency: z.enum(["urgent", "routine"], { message: "Choose urgent or routine" }).default("routine"),
  positionStatus: z.enum(["reported", "located"], { message: "Choose reported or located" }).default("reported"),
  validFrom: z.string().trim().min(1, "Give the date and time the notice comes into force"),
  validUntil: z.string().trim().optional().default(""),
  untilFurtherNotice: checkbox,
  generalArea: text(120, "Give the general area (e.g. NORTH SEA)"),
  locality: text(160, "Give the locality (e.g. Kestrel Sound, approach channel)"),
  charts: optionalText(200),
  body: text(4000, "Write the text of the notice"),
  relatedRefs: optionalText(200),
  aidIds: idList,
  reportIds: idList,
  acceptOutside: checkbox,
});

export type PartInput = { kind: PartKind; crs: string; positionsText: string; radiusNm: number | null };
export type ParsedPart = PartInput & { coordinates: LonLat[]; geometry: PartGeometry };

export type NoticeInput = Omit<z.infer<typeof noticeFieldsSchema>, "validFrom" | "validUntil" | "untilFurtherNotice"> & {
  validFrom: Date;
  validUntil: Date | null;
  parts: ParsedPart[];
};

export type NoticeFormResult = { ok: true; data: NoticeInput } | { ok: false; errors: Record<string, string> };

/** A `datetime-local` value (or ISO with offset) read in the harbour's zone. */
export function parseLocalDateTime(value: string, zone: string): Date | null {
  if (!value) return null;
  const hasOffset = /[zZ]|[+-]\d\d:?\d\d$/.test(value);
  const dt = hasOffset ? DateTime.fromISO(value, { setZone: true }) : DateTime.fromISO(value, { zone });
  if (!dt.isValid) return null;
  const y = dt.year;
  if (y < 2000 || y > 2100) return null;
  return dt.toJSDate();
}

/** A UTC instant as a `datetime-local` value in the harbour's zone. */
export function toLocalInput(iso: string | Date | null | undefined, zone: string): string {
  if (!iso) return "";
  const d = typeof iso === "string" ? new Date(iso) : iso;
  return DateTime.fromJSDate(d, { zone }).toFormat("yyyy-LL-dd'T'HH:mm");
}

/** The raw part fields of a form: parts.0.kind etc., in index order, empty trailing parts dropped. */
export function rawParts(raw: Record<string, unknown>): { index: number; kind: string; crs: string; positions: string; radiusNm: string }[] {
  const indices = new Set<number>();
  for (const key of Object.keys(raw)) {
    const m = /^parts\.(\d+)\./.exec(key);
    if (m && Number(m[1]) < 50) indices.add(Number(m[1]));
  }
  const str = (v: unknown) => (typeof v === "string" ? v : Array.isArray(v) ? String(v[0] ?? "") : "");
  return [...indices]
    .sort((a, b) => a - b)
    .map((i) => ({
      index: i,
      kind: str(raw[`parts.${i}.kind`]),
      crs: str(raw[`parts.${i}.crs`]),
      positions: str(raw[`parts.${i}.positions`]),
      radiusNm: str(raw[`parts.${i}.radiusNm`]).trim(),
    }))
    .filter((p) => p.positions.trim() !== "" || p.radiusNm !== "");
}

/**
 * Validate a submitted notice form. Error keys are field names (`parts.0.positions`, `validUntil` …)
 * so each message lands beside its field.
 */
export function parseNoticeForm(raw: Record<string, unknown>, zone: string): NoticeFormResult {
  const errors: Record<string, string> = {};
  const fields = noticeFieldsSchema.safeParse(raw);
  if (!fields.success) {
    for (const issue of fields.error.issues) {
      const key = String(issue.path[0] ?? "form");
      errors[key] ??= issue.message;
    }
  }
  let validFrom: Date | null = null;
  let validUntil: Date | null = null;
  if (fields.success) {
    validFrom = parseLocalDateTime(fields.data.validFrom, zone);
    if (!validFrom) errors.validFrom = "Give a valid date and time (e.g. 2026-12-01 14:00)";
    if (fields.data.untilFurtherNotice && fields.data.validUntil) {
      errors.validUntil = "Either give an end or tick “until further notice”, not both";
    } else if (!fields.data.untilFurtherNotice) {
      if (!fields.data.validUntil) errors.validUntil = "Give an end, or tick “until further notice”";
      else {
        validUntil = parseLocalDateTime(fields.data.validUntil, zone);
        if (!validUntil) errors.validUntil = "Give a valid date and time (e.g. 2026-12-21 18:00)";
        else if (validFrom && validUntil.getTime() <= validFrom.getTime()) errors.validUntil = "The end must be after the start";
      }
    }
  }

  const parts: ParsedPart[] = [];
  const given = rawParts(raw);
  if (given.length === 0) errors["parts.0.positions"] = "Enter at least one position (one per line), or draw on the map";
  if (given.length > MAX_PARTS) errors["parts.0.positions"] = `At most ${MAX_PARTS} geometry parts`;
  for (const p of given.slice(0, MAX_PARTS)) {
    const prefix = `parts.${p.index}`;
    if (!(PART_KINDS as readonly string[]).includes(p.kind)) {
      errors[`${prefix}.kind`] = "Choose point, line, area or circle";
      continue;
    }
    const kind = p.kind as PartKind;
    const crs = parseCrsCode(p.crs);
    if (!crs.ok) {
      errors[`${prefix}.crs`] = crs.error;
      continue;
    }
    let radiusNm: number | null = null;
    if (kind === "circle") {
      radiusNm = p.radiusNm === "" ? NaN : Number(p.radiusNm.replace(",", "."));
      if (!Number.isFinite(radiusNm) || radiusNm <= 0) {
        errors[`${prefix}.radiusNm`] = "A circle needs a radius greater than 0 nautical miles";
        continue;
      }
    }
    const lines = parsePositionLines(p.positions, crs.crs.id);
    const bad = lines.filter((l) => !l.ok);
    if (bad.length) {
      errors[`${prefix}.positions`] = bad
        .slice(0, 3)
        .map((l) => `Line ${l.line}: ${(l as { error: string }).error}`)
        .join("; ");
      continue;
    }
    const coords = lines.map((l) => [(l as { lon: number }).lon, (l as { lat: number }).lat] as LonLat);
    const checked = buildPartGeometry(kind, coords, radiusNm);
    if (!checked.ok) {
      errors[`${prefix}.${checked.field}`] = checked.error;
      continue;
    }
    parts.push({ kind, crs: crs.crs.id, positionsText: p.positions.replace(/\r\n/g, "\n").trim(), radiusNm, coordinates: coords, geometry: checked.geometry });
  }

  if (Object.keys(errors).length > 0 || !fields.success || !validFrom) return { ok: false, errors };
  const { untilFurtherNotice: _u, validFrom: _f, validUntil: _t, ...rest } = fields.data;
  return { ok: true, data: { ...rest, validFrom, validUntil, parts } };
}
