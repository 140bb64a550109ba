/** Search params of the /notices and /staff/notices tables (server-side filtering, sorting, paging). */
import { z } from "zod";
import { GENERAL_TYPE_KEYS } from "./vocabulary";

const SORTS = ["number", "published", "validFrom", "validUntil", "urgency", "type", "title", "updated"] as const;

export const listQuerySchema = z.object({
  status: z.enum(["in_force", "expired", "cancelled", "superseded", "published", "all", "draft"]).catch("in_force"),
  type: z.enum(GENERAL_TYPE_KEYS).optional().catch(undefined),
  urgency: z.enum(["urgent", "routine"]).optional().catch(undefined),
  q: z.string().trim().max(100).optional().catch(undefined),
  sort: z.enum(SORTS).catch("number"),
  dir: z.enum(["asc", "desc"]).optional().catch(undefined),
  page: z.coerce.number().int().min(1).max(100_000).catch(1),
});
export type ListQuery = z.infer<typeof listQuerySchema>;

/** Unknown or malformed values fall back to defaults (a list page never fails on its query). */
export function parseListQuery(params: URLSearchParams, defaults: Partial<ListQuery> = {}): ListQuery {
  const raw: Record<string, string> = {};
  for (const [k, v] of params) if (v !== "") raw[k] = v;
  return listQuerySchema.parse({ ...defaults, ...raw });
}

export function listHref(path: string, q: Partial<ListQuery>, change: Partial<ListQuery>): string {
  const merged = { ...q, ...change };
  const p = new URLSearchParams();
  for (const [k, v] of Object.entries(merged)) if (v !== undefined && v !== "" && !(k === "page" && v === 1)) p.set(k, String(v));
  const s = p.toString();
  return s ? `${path}?${s}` : path;
}
