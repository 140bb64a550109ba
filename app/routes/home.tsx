// The public notice board: the list of everything in force, urgent first, and a map of the
// notices in the visible extent and the harbour's aids, both fetched from the cacheable GeoJSON
// API after hydration (the document carries only the list; the map is a picture of it).
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { data, Link } from "react-router";
import type { Route } from "./+types/home";
import { Caution } from "~/components/Caution";
import { MapView, type Bbox, type LonLat, type MapFeature } from "~/components/map/MapView";
import { formatLocal } from "~/components/notices/format";
import { NoticeTable, noticeRowData } from "~/components/notices/NoticeTable";
import { env } from "~/env.server";
import { bboxOf } from "~/lib/notices/geometry";
import { getDefaultHarbour } from "~/models/harbour.server";
import { listInForce, listRecentlyEnded } from "~/models/notice.server";
import { publicRevision } from "~/models/public-revision.server";
import { forwardCacheHeaders, memoPayload, validatedHeaders, validatedPage } from "~/services/http-cache.server";

// What the board shows changes only with a write to notices, a notice lapsing by the clock, or
// the two-week window of "recently ended" moving on (checked by the hour).
export const middleware: Route.MiddlewareFunction[] = [
  validatedPage(async () => {
    const r = await publicRevision();
    return [r.notices, r.lapsedAt, Math.floor(Date.now() / 3_600_000)];
  }),
];
export const headers = forwardCacheHeaders;
export const meta: Route.MetaFunction = () => [{ title: "Notice board · Tidewire · Kestrel Sound" }];

/** The harbour boundary's extent (any GeoJSON geometry), for the map's first view. */
function boundsOf(geometry: { coordinates: unknown } | undefined): Bbox | null {
  const points: LonLat[] = [];
  const walk = (c: unknown) => {
    if (Array.isArray(c) && typeof c[0] === "number") points.push(c as LonLat);
    else if (Array.isArray(c)) c.forEach(walk);
  };
  walk(geometry?.coordinates);
  return points.length ? bboxOf(points) : null;
}

export async function loader({ request, context }: Route.LoaderArgs) {
  // Public page: no guard. The signed-in user only changes the cache key (validatedPage).
  const payload = await memoPayload(context, async () => {
    const harbour = await getDefaultHarbour();
    const zone = harbour?.timeZone ?? "Europe/London";
    const [inForce, ended] = await Promise.all([listInForce(harbour?.id, undefined, undefined, { withParts: false }), listRecentlyEnded(harbour?.id, 14, undefined, undefined, { withParts: false })]);
    return {
      harbourName: harbour?.name ?? "Kestrel Sound",
      authorityName: harbour?.authorityName ?? "",
      zone,
      basemap: harbour?.basemap ?? null,
      bounds: boundsOf(harbour?.boundary),
      tileUrl: env().MAP_TILE_URL ?? null,
      // Dates formatted here, in the harbour's zone (see NoticeRowData).
      inForce: inForce.map((n) => noticeRowData(n, zone)),
      ended: ended.map((n) => ({
        id: n.id,
        seriesNumber: n.seriesNumber,
        title: n.title,
        effectiveStatus: n.effectiveStatus,
        when: n.effectiveStatus === "expired" ? `ended ${formatLocal(n.validUntil, zone)}` : `${formatLocal(n.cancelledAt, zone)}${n.cancellationReason ? ` — ${n.cancellationReason}` : ""}`,
      })),
      lastChange: [...inForce, ...ended].reduce<string | null>((m, n) => (!m || n.updatedAt > m ? n.updatedAt : m), null),
    };
  });
  return data(payload, { headers: validatedHeaders(request, context, { lastModified: payload.lastChange ? new Date(payload.lastChange) : null }) });
}

type ApiFeature = { id: number | string; geometry: MapFeature["geometry"]; properties: Record<string, unknown> };

/** The aids layer from GET /api/v1/aids, once the map is there (`mapLive`; cached by the browser). */
function useAidFeatures(mapLive: boolean): MapFeature[] {
  const [aids, setAids] = useState<MapFeature[]>([]);
  useEffect(() => {
    if (!mapLive) return;
    let live = true;
    fetch("/api/v1/aids")
      .then((r) => (r.ok ? r.json() : null))
      .then((fc: { features: ApiFeature[] } | null) => {
        if (!live || !fc) return;
        setAids(
          fc.features.map((f) => ({
            type: "Feature",
            id: `aid-${f.id}`,
            geometry: f.geometry,
            properties: { symbol: "aid", ialaCategory: f.properties.ialaCategory, aidType: f.properties.aidType, status: f.properties.status, label: f.properties.code },
          })),
        );
      })
      .catch(() => {});
    return () => {
      live = false;
    };
  }, [mapLive]);
  return aids;
}

export default function Board({ loaderData }: Route.ComponentProps) {
  const d = loaderData;
  const [visible, setVisible] = useState<MapFeature[]>([]);
  // The map loads only when it nears the viewport (loadWhenVisible): its first move says it is there.
  const [mapLive, setMapLive] = useState(false);
  const aidFeatures = useAidFeatures(mapLive);
  const request = useRef(0);
  const onMoveEnd = useCallback((bbox: Bbox) => {
    setMapLive(true);
    const mine = ++request.current;
    fetch(`/api/v1/notices?bbox=${bbox.map((v) => v.toFixed(4)).join(",")}&limit=500`)
      .then((r) => (r.ok ? r.json() : null))
      .then((fc: { features: ApiFeature[] } | null) => {
        if (!fc || mine !== request.current) return;
        setVisible(
          fc.features.map((f) => ({
            type: "Feature",
            id: f.id,
            geometry: f.geometry,
            properties: { symbol: "notice", urgency: f.properties.urgency, status: f.properties.status, label: f.properties.seriesNumber ?? "", title: f.properties.title, href: `/notices/${f.id}` },
          })),
        );
      })
      .catch(() => {});
  }, []);
  const layers = useMemo(
    () => [
      { id: "aids", features: aidFeatures },
      { id: "notices", features: visible },
    ],
    [aidFeatures, visible],
  );
  const urgent = d.inForce.filter((n) => n.urgency === "urgent");
  // The map's layers arrive after hydration and re-render the board: the table stays as it is.
  const table = useMemo(() => <NoticeTable notices={d.inForce} zone={d.zone} caption="Notices in force" />, [d.inForce, d.zone]);
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-3xl font-bold">{d.harbourName} notice board</h1>
          <p className="mt-1 text-lg">
            Local navigational warnings of the {d.authorityName}: {d.inForce.length} in force
            {urgent.length ? (
              <>
                , <strong className="text-signal">{urgent.length} URGENT</strong>
              </>
            ) : null}
            .
          </p>
        </div>
        <p className="flex flex-wrap gap-2">
          <Link to="/notices" className="btn-secondary">
            All notices
          </Link>
          <Link to="/bulletin" className="btn-secondary">
            Printable bulletin
          </Link>
          <Link to="/report" className="btn-secondary">
            Report a mark out of position
          </Link>
          <Link to="/subscribe" className="btn-secondary">
            Get alerts
          </Link>
        </p>
      </div>
      <Caution />
      {urgent.length ? (
        <section aria-labelledby="urgent-heading" className="rounded-lg border-2 border-signal bg-signal-light p-4">
          <h2 id="urgent-heading" className="text-lg font-bold text-signal">
            ⚠ URGENT notices in force
          </h2>
          <ul className="mt-2 space-y-1">
            {urgent.map((n) => (
              <li key={n.id}>
                <span className="badge bg-signal text-white">Urgent</span>{" "}
                <Link to={`/notices/${n.id}`} className="font-semibold">
                  {n.seriesNumber} {n.title}
                </Link>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      <MapView
        ariaLabel="Map of the notices in force and the aids to navigation of the harbour. The same notices are listed in the table below."
        basemap={d.basemap}
        tileUrl={d.tileUrl}
        layers={layers}
        fit={d.bounds ?? "layers"}
        onMoveEnd={onMoveEnd}
        height="28rem"
        loadWhenVisible
      />
      <p className="text-xs text-slate">
        Map symbols: diamonds and outlined areas are notices (orange with “!” = urgent); buoy symbols follow the IALA colours and shapes (region A). Click a
        notice for its page.
      </p>
      <section aria-labelledby="inforce-heading">
        <h2 id="inforce-heading" className="text-xl font-bold">
          Notices in force
        </h2>
        <div className="mt-2">
          {table}
        </div>
      </section>
      {d.ended.length ? (
        <section aria-labelledby="ended-heading">
          <h2 id="ended-heading" className="text-xl font-bold">
            Recently cancelled or ended
          </h2>
          <ul className="mt-2 space-y-1" data-testid="ended-list">
            {d.ended.map((n) => (
              <li key={n.id} data-notice-id={n.id}>
                <span className="badge bg-mist text-slate">{n.effectiveStatus === "cancelled" ? "Cancelled" : n.effectiveStatus === "superseded" ? "Superseded" : "Expired"}</span>{" "}
                <Link to={`/notices/${n.id}`}>
                  {n.seriesNumber} {n.title}
                </Link>{" "}
                <span className="text-sm text-slate">{n.when}</span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      <p className="text-sm">
        Also as an <a href="/feeds/notices.atom">Atom feed</a> and a <Link to="/feeds">GeoJSON API</Link>.
      </p>
    </div>
  );
}
