// All notices as a sortable, filterable, paginated table. Filtering, sorting and paging are
// search params handled on the server, so the page works without JavaScript.
import { data, Form, Link } from "react-router";
import type { Route } from "./+types/notices";
import { Caution } from "~/components/Caution";
import { NoticeTable } from "~/components/notices/NoticeTable";
import { listHref, parseListQuery } from "~/lib/notices/list-query";
import { GENERAL_TYPES } from "~/lib/notices/vocabulary";
import { getDefaultHarbour } from "~/models/harbour.server";
import { listNotices } from "~/models/notice.server";
import { publicRevision } from "~/models/public-revision.server";
import { forwardCacheHeaders, memoPayload, validatedHeaders, validatedPage } from "~/services/http-cache.server";

// Lists only notices (the search params are part of the fingerprint).
export const middleware: Route.MiddlewareFunction[] = [
  validatedPage(async () => {
    const r = await publicRevision();
    return [r.notices, r.lapsedAt];
  }),
];
export const headers = forwardCacheHeaders;
export const meta: Route.MetaFunction = () => [{ title: "All notices · Tidewire · Kestrel Sound" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  // Public page (drafts are never listed here).
  const payload = await memoPayload(context, () => buildPayload(request));
  return data(payload, { headers: validatedHeaders(request, context, { lastModified: payload.lastModified }) });
}

async function buildPayload(request: Request) {
  const url = new URL(request.url);
  const q = parseListQuery(url.searchParams);
  const status = q.status === "draft" ? "in_force" : q.status;
  const harbour = await getDefaultHarbour();
  const result = await listNotices({ harbourId: harbour?.id, status, generalTypes: q.type ? [q.type] : undefined, urgency: q.urgency, q: q.q, sort: q.sort, dir: q.dir, page: q.page, perPage: 25 });
  return { q: { ...q, status }, zone: harbour?.timeZone ?? "Europe/London", ...result };
}

const STATUS_OPTIONS = [
  { value: "in_force", label: "In force" },
  { value: "published", label: "All published" },
  { value: "expired", label: "Expired" },
  { value: "cancelled", label: "Cancelled" },
  { value: "superseded", label: "Superseded" },
];

export default function NoticesPage({ loaderData }: Route.ComponentProps) {
  const { q, notices, total, page, pages, zone } = loaderData;
  const dir = q.dir ?? (q.sort === "title" || q.sort === "type" ? "asc" : "desc");
  return (
    <div className="space-y-5">
      <h1 className="text-2xl font-bold">Notices</h1>
      <Caution compact />
      <Form method="get" className="card grid gap-3 sm:grid-cols-2 lg:grid-cols-5" role="search" aria-label="Filter notices">
        <div>
          <label htmlFor="f-status" className="field-label">
            Status
          </label>
          <select id="f-status" name="status" defaultValue={q.status} className="field-input">
            {STATUS_OPTIONS.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="f-type" className="field-label">
            Type
          </label>
          <select id="f-type" name="type" defaultValue={q.type ?? ""} className="field-input">
            <option value="">Any type</option>
            {GENERAL_TYPES.map((g) => (
              <option key={g.key} value={g.key}>
                {g.label}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="f-urgency" className="field-label">
            Urgency
          </label>
          <select id="f-urgency" name="urgency" defaultValue={q.urgency ?? ""} className="field-input">
            <option value="">Urgent and routine</option>
            <option value="urgent">Urgent only</option>
            <option value="routine">Routine only</option>
          </select>
        </div>
        <div>
          <label htmlFor="f-q" className="field-label">
            Text or number
          </label>
          <input id="f-q" name="q" defaultValue={q.q ?? ""} className="field-input" placeholder="e.g. KS3 or 2026/014" />
        </div>
        <div className="flex items-end gap-2">
          <input type="hidden" name="sort" value={q.sort} />
          <button type="submit" className="btn-primary">
            Filter
          </button>
          <Link to="/notices" className="btn-secondary">
            Reset
          </Link>
        </div>
      </Form>
      <p className="text-sm text-slate" aria-live="polite">
        {total} notice{total === 1 ? "" : "s"} · page {page} of {pages}
      </p>
      <NoticeTable notices={notices} zone={zone} sort={q.sort} dir={dir} sortHref={(key, d) => listHref("/notices", q, { sort: key as typeof q.sort, dir: d, page: 1 })} caption="Notices" />
      <nav aria-label="Pages" className="flex gap-3">
        {page > 1 ? (
          <Link to={listHref("/notices", q, { page: page - 1 })} className="btn-secondary" rel="prev">
            ← Previous
          </Link>
        ) : null}
        {page < pages ? (
          <Link to={listHref("/notices", q, { page: page + 1 })} className="btn-secondary" rel="next">
            Next →
          </Link>
        ) : null}
      </nav>
    </div>
  );
}
