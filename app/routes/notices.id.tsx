import { data, Form, Link } from "react-router";
import type { Route } from "./+types/notices.id";
import { Caution } from "~/components/Caution";
import { MapView } from "~/components/map/MapView";
import { noticeMapFeature } from "~/components/notices/features";
import { formatLocal } from "~/components/notices/format";
import { NoticeDetail } from "~/components/notices/NoticeDetail";
import { renderBroadcast } from "~/lib/notices/broadcast";
import { env } from "~/env.server";
import { parseCrsCode } from "~/lib/geo/crs";
import { can } from "~/lib/permissions";
import { crsLabel, crsOptions, positionRows } from "~/lib/notices/position-table";
import { getDefaultHarbour } from "~/models/harbour.server";
import { getNotice, listAudit } from "~/models/notice.server";
import { publicRevision } from "~/models/public-revision.server";
import { getOptionalUser } from "~/services/auth.server";
import { forwardCacheHeaders, memoPayload, validatedHeaders, validatedPage } from "~/services/http-cache.server";

// The page shows one notice, its history and the names of its linked aids: any write to notices
// or aids, or a notice lapsing by the clock, makes a new copy.
export const middleware: Route.MiddlewareFunction[] = [
  validatedPage(async () => {
    const r = await publicRevision();
    return [r.notices, r.aids, r.lapsedAt];
  }),
];
export const headers = forwardCacheHeaders;

export const meta: Route.MetaFunction = ({ data }) => [
  { title: data ? `${data.notice.seriesNumber ?? "Draft"} ${data.notice.title} · Tidewire` : "Notice · Tidewire" },
];

export const links: Route.LinksFunction = () => [{ rel: "stylesheet", href: "/notice-print.css", media: "print" }];

const PUBLIC_ACTIONS = new Set(["published", "amended", "cancelled", "superseded", "expired"]);

export async function loader({ request, params, context }: Route.LoaderArgs) {
  // Public page; drafts only for staff who may draft (the user is part of the fingerprint).
  const payload = await memoPayload(context, () => buildPayload(request, params.id));
  return data(payload, { headers: validatedHeaders(request, context, { lastModified: new Date(payload.notice.updatedAt) }) });
}

async function buildPayload(request: Request, id: string) {
  const user = await getOptionalUser(request);
  const params = { id };
  if (!/^\d{1,10}$/.test(params.id)) throw data({ error: "There is no notice at this address." }, { status: 404 });
  const notice = await getNotice(Number(params.id));
  if (!notice || (notice.status === "draft" && !can(user?.role, "notice:draft"))) throw data({ error: "There is no notice at this address." }, { status: 404 });
  const harbour = await getDefaultHarbour();
  const url = new URL(request.url);
  const crsParam = url.searchParams.get("crs");
  let chosenCrs: string | null = null;
  let crsError: string | null = null;
  if (crsParam) {
    const c = parseCrsCode(crsParam);
    if (c.ok) chosenCrs = c.crs.id;
    else crsError = c.error;
  }
  const history = (await listAudit(notice.id))
    .filter((a) => PUBLIC_ACTIONS.has(a.action))
    .map((a) => ({ action: a.action, at: a.at, reason: a.reason, version: a.version }));
  const crsLabels = Object.fromEntries([...new Set(notice.parts.map((p) => p.crs))].map((id) => [id, crsLabel(id)]));
  const payload = {
    notice,
    zone: harbour?.timeZone ?? "Europe/London",
    basemap: harbour?.basemap ?? null,
    tileUrl: env().MAP_TILE_URL ?? null,
    positions: positionRows(notice, chosenCrs),
    // Made here, so the browser needs none of the geometry code (proj4, turf) for this page.
    broadcast: renderBroadcast(notice),
    mapFeatures: [noticeMapFeature(notice, false)],
    crsLabels,
    chosenCrs,
    chosenCrsLabel: chosenCrs ? crsLabel(chosenCrs) : null,
    crsError,
    crsOptions: crsOptions(),
    history,
    canEdit: can(user?.role, "notice:draft") && (notice.effectiveStatus === "draft" || notice.effectiveStatus === "in_force"),
  };
  return payload;
}

export default function NoticePage({ loaderData }: Route.ComponentProps) {
  const d = loaderData;
  const n = d.notice;
  return (
    <div className="space-y-6">
      <nav className="no-print text-sm" aria-label="Breadcrumb">
        <Link to="/">Notice board</Link> › <Link to="/notices">All notices</Link> › {n.seriesNumber ?? "Draft"}
      </nav>
      <Caution compact />
      <div className="grid grid-cols-1 gap-6 lg:grid-cols-[minmax(0,1fr)_26rem]">
        <NoticeDetail notice={n} zone={d.zone} positions={d.positions} crsLabels={d.crsLabels} chosenCrsLabel={d.chosenCrsLabel} broadcast={d.broadcast} />
        <aside className="space-y-4">
          <div className="notice-map">
            <MapView ariaLabel={`Map of ${n.seriesNumber ?? "the draft"}: ${n.title}. The positions are listed in the table.`} basemap={d.basemap} tileUrl={d.tileUrl} layers={[{ id: "notice", features: d.mapFeatures }]} height="22rem" />
          </div>
          <Form method="get" className="no-print card space-y-2">
            <label htmlFor="crs" className="field-label">
              Show the positions also in
            </label>
            <select id="crs" name="crs" className="field-input" defaultValue={d.chosenCrs ?? ""} aria-invalid={d.crsError ? true : undefined} aria-describedby={d.crsError ? "crs-error" : undefined}>
              <option value="">(choose a datum or grid)</option>
              {d.crsOptions.map((o) => (
                <option key={o.value} value={o.value}>
                  {o.label}
                </option>
              ))}
            </select>
            {d.crsError ? (
              <p id="crs-error" className="field-error" role="alert">
                {d.crsError}
              </p>
            ) : null}
            <button type="submit" className="btn-secondary">
              Show
            </button>
          </Form>
          <div className="no-print card space-y-2 text-sm">
            <p>
              <a href={`/notices/${n.id}/gpx`} download>
                Download positions as GPX
              </a>
            </p>
            {n.status !== "draft" ? (
              <p>
                <a href={`/api/v1/notices/${n.id}`}>GeoJSON (API)</a>
              </p>
            ) : null}
            <p>
              <button type="button" className="btn-secondary" onClick={() => window.print()}>
                Print this notice
              </button>
            </p>
            {d.canEdit ? (
              <p>
                <Link to={`/staff/notices/${n.id}/edit`} className="btn-primary">
                  Open in the staff editor
                </Link>
              </p>
            ) : null}
          </div>
          {d.history.length ? (
            <section className="card text-sm" aria-labelledby="history-heading">
              <h2 id="history-heading" className="font-bold">
                History
              </h2>
              <ol className="mt-2 space-y-1">
                {d.history.map((h) => (
                  <li key={`${h.version}-${h.action}`}>
                    {formatLocal(h.at, d.zone)} — {h.action}
                    {h.reason ? `: ${h.reason}` : ""}
                  </li>
                ))}
              </ol>
            </section>
          ) : null}
        </aside>
      </div>
    </div>
  );
}
