/** Query parameters of GET /api/v1/notices, validated; errors name the parameter. */
import { z } from "zod";
import { GENERAL_TYPE_KEYS } from "./vocabulary";

export const API_MAX_LIMIT = 500;
export const API_DEFAULT_LIMIT = 100;

const isoDate = (name: string) =>
  z
    .string()
    .trim()
    .refine((s) => /^\d{4}-\d{2}-\d{2}([T ]\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})?)?$/.test(s) && !Number.isNaN(Date.parse(s)), {
      message: `${name} must be an ISO 8601 date or date-time, e.g. 2026-12-01T00:00:00Z`,
    })
    .transform((s) => new Date(s));

export const apiQuerySchema = z.object({
  bbox: z
    .string()
    .trim()
    .transform((s, ctx) => {
      const parts = s.split(",").map((p) => Number(p.trim()));
      if (parts.length !== 4 || parts.some((n) => !Number.isFinite(n))) {
        ctx.addIssue({ code: "custom", message: "bbox must be four numbers: minLon,minLat,maxLon,maxLat (WGS 84 degrees)" });
        return z.NEVER;
      }
      const [minLon, minLat, maxLon, maxLat] = parts as [number, number, number, number];
      if (Math.abs(minLon) > 180 || Math.abs(maxLon) > 180 || Math.abs(minLat) > 90 || Math.abs(maxLat) > 90) {
        ctx.addIssue({ code: "custom", message: "bbox longitudes must be within ±180 and latitudes within ±90" });
        return z.NEVER;
      }
      if (minLon >= maxLon || minLat >= maxLat) {
        ctx.addIssue({ code: "custom", message: "bbox must be minLon,minLat,maxLon,maxLat with min < max (areas across the 180° meridian: make two requests)" });
        return z.NEVER;
      }
      return [minLon, minLat, maxLon, maxLat] as [number, number, number, number];
    })
    .optional(),
  status: z.enum(["in_force", "expired", "cancelled", "superseded", "published", "all"], { message: "status must be in_force, expired, cancelled, superseded, published or all" }).default("in_force"),
  type: z
    .string()
    .trim()
    .transform((s) => s.split(",").map((t) => t.trim()).filter(Boolean))
    .pipe(z.array(z.enum(GENERAL_TYPE_KEYS, { message: `type must be one or more of: ${GENERAL_TYPE_KEYS.join(", ")}` })))
    .optional(),
  urgency: z.enum(["urgent", "routine"], { message: "urgency must be urgent or routine" }).optional(),
  since: isoDate("since").optional(),
  updatedSince: isoDate("updatedSince").optional(),
  limit: z.coerce.number({ message: "limit must be a number" }).int("limit must be a whole number").min(1, "limit must be at least 1").max(API_MAX_LIMIT, `limit must be at most ${API_MAX_LIMIT}`).default(API_DEFAULT_LIMIT),
  cursor: z
    .string()
    .trim()
    .transform((s, ctx) => {
      let decoded = "";
      try {
        decoded = atob(s.replace(/-/g, "+").replace(/_/g, "/"));
      } catch {
        /* handled below */
      }
      const m = /^after:(\d{1,10})$/.exec(decoded);
      if (!m) {
        ctx.addIssue({ code: "custom", message: "cursor is not one this API gave out: use the `next` link of the previous page" });
        return z.NEVER;
      }
      return Number(m[1]);
    })
    .optional(),
});

export type ApiQuery = z.infer<typeof apiQuerySchema>;

export function encodeCursor(afterId: number): string {
  return btoa(`after:${afterId}`).replace(/\+/g, "-").replace(/\//g, "_").replace(/=+$/, "");
}

export function parseApiQuery(params: URLSearchParams): { ok: true; query: ApiQuery } | { ok: false; error: string; field: string } {
  const raw: Record<string, string> = {};
  for (const [k, v] of params) if (k in apiQuerySchema.shape) raw[k] = v;
  const r = apiQuerySchema.safeParse(raw);
  if (r.success) return { ok: true, query: r.data };
  const issue = r.error.issues[0]!;
  return { ok: false, error: issue.message, field: String(issue.path[0] ?? "query") };
}
