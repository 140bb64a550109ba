// Staff list of notices: drafts waiting for publication, and everything published.
import { Link } from "react-router";
import type { Route } from "./+types/staff.notices";
import { NoticeTable } from "~/components/notices/NoticeTable";
import { listHref, parseListQuery } from "~/lib/notices/list-query";
import { can } from "~/lib/permissions";
import { getDefaultHarbour } from "~/models/harbour.server";
import { listNotices } from "~/models/notice.server";
import { requireCapability } from "~/services/auth.server";

export const meta: Route.MetaFunction = () => [{ title: "Notices · Staff · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "notice:draft");
  const q = parseListQuery(new URL(request.url).searchParams, { sort: "updated" });
  const harbour = await getDefaultHarbour();
  const [drafts, published] = await Promise.all([
    listNotices({ harbourId: harbour?.id, status: "draft", sort: "updated", perPage: 100 }),
    listNotices({ harbourId: harbour?.id, status: q.status === "draft" ? "in_force" : q.status, q: q.q, sort: q.sort, dir: q.dir, page: q.page, perPage: 25 }),
  ]);
  return { q, zone: harbour?.timeZone ?? "Europe/London", drafts: drafts.notices, published, canPublish: can(user.role, "notice:publish") };
}

export default function StaffNotices({ loaderData }: Route.ComponentProps) {
  const { q, zone, drafts, published, canPublish } = loaderData;
  const edit = (n: { id: number; effectiveStatus: string }) => (n.effectiveStatus === "draft" || n.effectiveStatus === "in_force" ? `/staff/notices/${n.id}/edit` : `/notices/${n.id}`);
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-2xl font-bold">Notices</h1>
        <Link to="/staff/notices/new" className="btn-primary">
          New notice
        </Link>
      </div>
      <section aria-labelledby="drafts-heading">
        <h2 id="drafts-heading" className="text-lg font-bold">
          Drafts {canPublish ? "waiting for you to publish" : "(a harbourmaster publishes them)"}
        </h2>
        <NoticeTable notices={drafts} zone={zone} hrefFor={edit} caption="Drafts" />
      </section>
      <section aria-labelledby="pub-heading" className="space-y-2">
        <h2 id="pub-heading" className="text-lg font-bold">
          Published
        </h2>
        <nav className="flex flex-wrap gap-2 text-sm" aria-label="Status">
          {(["in_force", "published", "expired", "cancelled", "superseded"] as const).map((s) => (
            <Link key={s} to={listHref("/staff/notices", q, { status: s, page: 1 })} className={q.status === s ? "btn-primary" : "btn-secondary"}>
              {s === "published" ? "All" : s.replace("_", " ")}
            </Link>
          ))}
        </nav>
        <NoticeTable notices={published.notices} zone={zone} hrefFor={edit} sort={q.sort} dir={q.dir} sortHref={(key, d) => listHref("/staff/notices", q, { sort: key as typeof q.sort, dir: d })} caption="Published notices" />
        <nav aria-label="Pages" className="flex gap-3">
          {published.page > 1 ? (
            <Link to={listHref("/staff/notices", q, { page: published.page - 1 })} className="btn-secondary">
              ← Previous
            </Link>
          ) : null}
          {published.page < published.pages ? (
            <Link to={listHref("/staff/notices", q, { page: published.page + 1 })} className="btn-secondary">
              Next →
            </Link>
          ) : null}
        </nav>
      </section>
    </div>
  );
}
