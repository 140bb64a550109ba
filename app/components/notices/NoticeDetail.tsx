import { Link } from "react-router";
import type { NoticeView } from "~/lib/notices/types";
import { detailTypeLabel, generalTypeLabel, PART_KIND_LABELS, restrictionLabel } from "~/lib/notices/vocabulary";
import type { PositionRow } from "~/lib/notices/position-table";
import { formatLocal, formatUtc } from "./format";
import { NoticeBadges } from "./NoticeBadges";


/** A notice as the public sees it: heading, state, text, dates, references, positions, broadcast text. */
export function NoticeDetail({
  notice,
  zone,
  positions,
  crsLabels,
  chosenCrsLabel,
  broadcast,
}: {
  notice: NoticeView;
  zone: string;
  positions: PositionRow[];
  crsLabels: Record<string, string>;
  chosenCrsLabel: string | null;
  /** renderBroadcast(notice), made by the loader: the geometry code stays out of the browser. */
  broadcast: string;
}) {
  const n = notice;
  const ended = n.effectiveStatus !== "in_force" && n.effectiveStatus !== "draft";
  return (
    <article className="space-y-5" aria-labelledby="notice-title">
      <header className={`rounded-lg border-l-8 bg-white p-4 shadow-sm ${n.urgency === "urgent" ? "border-signal" : "border-deep"}`}>
        <p className="position text-sm font-bold text-slate">{n.seriesNumber ?? "Draft — not yet published"}</p>
        <h1 id="notice-title" className="mt-1 text-2xl font-bold">
          {n.title}
        </h1>
        <p className="mt-2">
          <NoticeBadges status={n.effectiveStatus} urgency={n.urgency} />
        </p>
        {n.effectiveStatus === "cancelled" ? (
          <p className="mt-3 rounded bg-danger-light px-3 py-2 font-semibold text-danger" role="status" data-testid="notice-state">
            CANCELLED {formatLocal(n.cancelledAt, zone)}. Reason: {n.cancellationReason}
          </p>
        ) : null}
        {n.effectiveStatus === "superseded" ? (
          <p className="mt-3 rounded bg-mist px-3 py-2 font-semibold" role="status" data-testid="notice-state">
            SUPERSEDED by{" "}
            <Link to={`/notices/${n.supersededByNoticeId}`}>{n.supersededBySeriesNumber ?? "a newer notice"}</Link> on {formatLocal(n.cancelledAt, zone)}.
          </p>
        ) : null}
        {n.effectiveStatus === "expired" ? (
          <p className="mt-3 rounded bg-mist px-3 py-2 font-semibold" role="status" data-testid="notice-state">
            EXPIRED at its stated end, {formatLocal(n.validUntil, zone)}. Kept here for the record.
          </p>
        ) : null}
      </header>

      <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-[max-content_1fr]">
        <dt className="font-semibold">In force</dt>
        <dd>
          from {formatLocal(n.validFrom, zone)} ({formatUtc(n.validFrom)}){" "}
          {n.validUntil ? (
            <>
              until {formatLocal(n.validUntil, zone)} ({formatUtc(n.validUntil)})
            </>
          ) : (
            "until further notice"
          )}
        </dd>
        <dt className="font-semibold">Published</dt>
        <dd>{n.publishedAt ? `${formatLocal(n.publishedAt, zone)} (${formatUtc(n.publishedAt)})` : "Not yet"}</dd>
        <dt className="font-semibold">General area · locality</dt>
        <dd>
          {n.generalArea} · {n.locality}
        </dd>
        <dt className="font-semibold">Type</dt>
        <dd>
          {generalTypeLabel(n.generalType)}
          {n.detailTypes.length ? ` — ${n.detailTypes.map(detailTypeLabel).join(", ")}` : ""}
        </dd>
        {n.restrictions.length ? (
          <>
            <dt className="font-semibold">Restrictions</dt>
            <dd className="font-semibold">{n.restrictions.map(restrictionLabel).join(", ")}</dd>
          </>
        ) : null}
        {n.charts ? (
          <>
            <dt className="font-semibold">Charts</dt>
            <dd>{n.charts}</dd>
          </>
        ) : null}
        {n.supersedesNoticeId ? (
          <>
            <dt className="font-semibold">Cancels</dt>
            <dd>
              <Link to={`/notices/${n.supersedesNoticeId}`}>{n.supersedesSeriesNumber ?? `notice ${n.supersedesNoticeId}`}</Link>
            </dd>
          </>
        ) : null}
        {n.relatedRefs ? (
          <>
            <dt className="font-semibold">Related</dt>
            <dd>{n.relatedRefs}</dd>
          </>
        ) : null}
        {n.aids.length ? (
          <>
            <dt className="font-semibold">Aids concerned</dt>
            <dd>{n.aids.map((a) => `${a.code} (${a.name})`).join(", ")}</dd>
          </>
        ) : null}
        <dt className="font-semibold">Positions</dt>
        <dd>{n.positionStatus === "located" ? "Located (confirmed by survey)" : "Reported (not confirmed by survey)"}</dd>
      </dl>

      <section aria-labelledby="text-heading">
        <h2 id="text-heading" className="text-lg font-bold">
          Text
        </h2>
        <p className="mt-1 max-w-3xl whitespace-pre-line">{n.body}</p>
      </section>

      <section aria-labelledby="positions-heading">
        <h2 id="positions-heading" className="text-lg font-bold">
          Positions
        </h2>
        {n.parts.map((p) => (
          // Scrolls sideways on a phone: a focusable, named region so the keyboard can scroll it.
          <div key={p.seq} className="mt-3 overflow-x-auto" tabIndex={0} role="region" aria-label={`Positions of part ${p.seq}`}>
            <table className="min-w-full border-collapse bg-white text-sm" data-testid={`positions-part-${p.seq}`}>
              <caption className="py-1 text-left font-semibold">
                Part {p.seq}: {PART_KIND_LABELS[p.kind]}
                {p.kind === "circle" ? `, radius ${p.radiusNm} M (${Math.round((p.radiusNm ?? 0) * 1852)} m)` : ""} — entered in {crsLabels[p.crs] ?? p.crs}
              </caption>
              <thead>
                <tr className="border-b border-mist text-left">
                  <th scope="col" className="px-2 py-1">
                    #
                  </th>
                  <th scope="col" className="px-2 py-1">
                    As entered ({crsLabels[p.crs] ?? p.crs})
                  </th>
                  <th scope="col" className="px-2 py-1">
                    WGS 84 (degrees, minutes)
                  </th>
                  <th scope="col" className="px-2 py-1">
                    WGS 84 (decimal degrees)
                  </th>
                  {chosenCrsLabel ? (
                    <th scope="col" className="px-2 py-1">
                      {chosenCrsLabel}
                    </th>
                  ) : null}
                </tr>
              </thead>
              <tbody>
                {positions
                  .filter((r) => r.part === p.seq)
                  .map((r) => (
                    <tr key={r.index} className="border-b border-mist/60">
                      <td className="px-2 py-1">{r.index}</td>
                      <td className="position px-2 py-1">{r.entered}</td>
                      <td className="position px-2 py-1" data-testid="wgs84-ddm">
                        {r.wgs84Ddm}
                      </td>
                      <td className="position px-2 py-1" data-testid="wgs84-dd">
                        {r.wgs84Dd}
                      </td>
                      {chosenCrsLabel ? <td className="position px-2 py-1">{r.chosen}</td> : null}
                    </tr>
                  ))}
              </tbody>
            </table>
          </div>
        ))}
      </section>

      <section aria-labelledby="broadcast-heading">
        <h2 id="broadcast-heading" className="text-lg font-bold">
          Broadcast text
        </h2>
        <pre className={`mt-1 overflow-x-auto rounded-md border border-mist bg-white p-3 font-mono text-sm ${ended ? "text-slate" : ""}`} data-testid="broadcast">
          {broadcast}
        </pre>
      </section>
    </article>
  );
}
