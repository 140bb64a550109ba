// The subscribe / manage form, parsed and checked in one place (used by the routes).
import { z } from "zod";
import { GENERAL_TYPE_KEYS } from "../notices/vocabulary";
import { AreaError, parseArea, type SubscriptionArea } from "./area";
import { subscriberEmail } from "./email";
import { ScheduleError, validateSchedule, type DigestSchedule } from "./schedule";

export type SubscriptionFormData = {
  email: string;
  area: SubscriptionArea;
  generalTypes: string[];
  urgentAlerts: boolean;
  digest: DigestSchedule;
};

const text = (max: number) => z.string().max(max, `At most ${max} characters.`).optional().default("");

const baseSchema = z.object({
  areaKind: z.enum(["harbour", "circle", "polygon"], { error: "Choose the area: the whole harbour, a circle or a polygon." }),
  centre: text(200),
  radiusNm: text(20),
  polygon: text(12_000),
  generalTypes: z
    .union([z.string(), z.array(z.string())])
    .optional()
    .transform((v) => (v === undefined ? [] : Array.isArray(v) ? v : [v]))
    .pipe(z.array(z.enum(GENERAL_TYPE_KEYS, { error: "Unknown notice type." })).max(GENERAL_TYPE_KEYS.length)),
  urgentAlerts: z.union([z.literal("on"), z.literal("true"), z.literal("1")]).optional(),
  digestCadence: z.enum(["none", "daily", "weekly"], { error: "Choose how often you want a digest." }),
  digestLocalTime: text(10),
  digestWeekday: text(2),
});

export type FormResult = { ok: true; data: SubscriptionFormData } | { ok: false; errors: Record<string, string> };

/** Parses the form; `withEmail` false for the manage form (the address cannot change there). */
export function parseSubscriptionForm(raw: Record<string, unknown>, timeZone: string, opts: { withEmail: boolean; now?: Date }): FormResult {
  const errors: Record<string, string> = {};
  let email = "";
  if (opts.withEmail) {
    const e = subscriberEmail.safeParse(typeof raw.email === "string" ? raw.email : "");
    if (e.success) email = e.data;
    else errors.email = e.error.issues[0].message;
  }
  const parsed = baseSchema.safeParse(raw);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) errors[String(issue.path[0] ?? "form")] ??= issue.message;
    return { ok: false, errors };
  }
  const d = parsed.data;
  let area: SubscriptionArea | undefined;
  try {
    area = parseArea(d);
  } catch (err) {
    if (!(err instanceof AreaError)) throw err;
    errors[err.field] = err.message;
  }
  const digest: DigestSchedule = {
    cadence: d.digestCadence,
    localTime: d.digestCadence === "none" ? null : d.digestLocalTime.trim() || null,
    weekday: d.digestCadence === "weekly" ? Number(d.digestWeekday) || null : null,
  };
  try {
    validateSchedule(digest, timeZone, opts.now);
  } catch (err) {
    if (!(err instanceof ScheduleError)) throw err;
    errors[err.field] = err.message;
  }
  const urgentAlerts = d.urgentAlerts !== undefined;
  if (!urgentAlerts && digest.cadence === "none") errors.digestCadence ??= "Choose urgent alerts, a digest, or both: otherwise there is nothing to send you.";
  if (Object.keys(errors).length > 0 || !area) return { ok: false, errors };
  return { ok: true, data: { email, area, generalTypes: [...new Set(d.generalTypes)], urgentAlerts, digest } };
}

/** FormData → plain object (repeated keys become arrays), for parseSubscriptionForm. */
export function formToObject(form: FormData): Record<string, unknown> {
  const raw: Record<string, unknown> = {};
  for (const key of new Set(form.keys())) {
    const all = form.getAll(key).filter((v): v is string => typeof v === "string");
    raw[key] = all.length > 1 ? all : all[0];
  }
  return raw;
}
