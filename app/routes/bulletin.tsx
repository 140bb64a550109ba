// A printable bulletin of every notice in force, in broadcast form with position tables.
import { data, Link } from "react-router";
import type { Route } from "./+types/bulletin";
import { Caution } from "~/components/Caution";
import { formatLocal, formatUtc } from "~/components/notices/format";
import { NoticeBadges } from "~/components/notices/NoticeBadges";
import { renderBroadcast } from "~/lib/notices/broadcast";
import { getDefaultHarbour } from "~/models/harbour.server";
import { lastPublicChange, listInForce } from "~/models/notice.server";
import { publicRevision } from "~/models/public-revision.server";
import { forwardCacheHeaders, memoPayload, validatedHeaders, validatedPage } from "~/services/http-cache.server";

// The bulletin says when it was generated, to the minute.
export const middleware: Route.MiddlewareFunction[] = [
  validatedPage(async () => {
    const r = await publicRevision();
    return [r.notices, r.lapsedAt, new Date().toISOString().slice(0, 16)];
  }),
];
export const headers = forwardCacheHeaders;
export const meta: Route.MetaFunction = () => [{ title: "Bulletin of notices in force · Tidewire" }];
export const links: Route.LinksFunction = () => [{ rel: "stylesheet", href: "/notice-print.css", media: "print" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  // Public page.
  const payload = await memoPayload(context, buildPayload);
  return data(payload, { headers: validatedHeaders(request, context, { lastModified: payload.lastChange }) });
}

async function buildPayload() {
  const harbour = await getDefaultHarbour();
  const [notices, lastChange] = await Promise.all([listInForce(harbour?.id), lastPublicChange()]);
  const generatedAt = new Date().toISOString();
  const payload = {
    authority: harbour?.authorityName ?? "",
    zone: harbour?.timeZone ?? "Europe/London",
    vhf: harbour?.vhfContact ?? null,
    generatedAt,
    lastChange,
    notices: notices.map((n) => ({ id: n.id, seriesNumber: n.seriesNumber, title: n.title, urgency: n.urgency, status: n.effectiveStatus, validFrom: n.validFrom, validUntil: n.validUntil, text: renderBroadcast(n) })),
  };
  return payload;
}

export default function Bulletin({ loaderData }: Route.ComponentProps) {
  const d = loaderData;
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h1 className="text-2xl font-bold">{d.authority}: local navigational warnings in force</h1>
        <button type="button" className="no-print btn-secondary" onClick={() => window.print()}>
          Print
        </button>
      </div>
      <p>
        Bulletin as at {formatLocal(d.generatedAt, d.zone)} ({formatUtc(d.generatedAt)}): {d.notices.length} notice{d.notices.length === 1 ? "" : "s"} in force.
        {d.vhf ? ` Harbour radio: ${d.vhf}.` : ""}
      </p>
      <Caution />
      {d.notices.length === 0 ? <p>No notices are in force.</p> : null}
      <ol className="space-y-4">
        {d.notices.map((n) => (
          <li key={n.id} className={`bulletin-item card ${n.urgency === "urgent" ? "border-2 border-signal" : ""}`}>
            <h2 className="text-lg font-bold">
              <Link to={`/notices/${n.id}`}>
                {n.seriesNumber} {n.title}
              </Link>{" "}
              <NoticeBadges status={n.status} urgency={n.urgency} />
            </h2>
            <pre className="mt-2 overflow-x-auto font-mono text-sm whitespace-pre-wrap">{n.text}</pre>
          </li>
        ))}
      </ol>
    </div>
  );
}
