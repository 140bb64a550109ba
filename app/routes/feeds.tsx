// Feeds and API: what a reader or a program can subscribe to or fetch.
import { data, Link } from "react-router";
import type { Route } from "./+types/feeds";
import { GENERAL_TYPES } from "~/lib/notices/vocabulary";
import { pageCacheHeaders, forwardCacheHeaders, conditionalGet } from "~/services/http-cache.server";

export const middleware: Route.MiddlewareFunction[] = [conditionalGet];
export const headers = forwardCacheHeaders;
export const meta: Route.MetaFunction = () => [{ title: "Feeds and API · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  // Public page (static content).
  const origin = new URL(request.url).origin;
  return data({ origin }, { headers: pageCacheHeaders(request, { origin, v: 1 }, { maxAgeS: 300 }) });
}

export default function Feeds({ loaderData }: Route.ComponentProps) {
  const o = loaderData.origin;
  const ex = (path: string) => (
    <code className="block overflow-x-auto rounded bg-white p-2 font-mono text-sm">
      curl &apos;{o}
      {path}&apos;
    </code>
  );
  return (
    <div className="max-w-4xl space-y-6">
      <h1 className="text-2xl font-bold">Feeds and API</h1>
      <p>Everything here is public and needs no key. Positions are WGS 84 (longitude, latitude in GeoJSON). Drafts are never shown.</p>
      <section className="card space-y-2">
        <h2 className="text-lg font-bold">Atom feed</h2>
        <p>
          <a href="/feeds/notices.atom">/feeds/notices.atom</a> — one entry for each publication, amendment, cancellation, supersession and expiry (RFC 4287).
        </p>
      </section>
      <section className="card space-y-3">
        <h2 className="text-lg font-bold">GeoJSON API</h2>
        <p>
          <code>GET /api/v1/notices</code> — a FeatureCollection (RFC 7946) of notices, ordered by id, at most <code>limit</code> (1–500, default 100) per page.
          Follow <code>links[rel=next]</code> (or the <code>Link</code> header) for the next page.
        </p>
        <ul className="list-disc space-y-1 pl-6 text-sm">
          <li>
            <code>bbox=minLon,minLat,maxLon,maxLat</code> — notices with a part intersecting the box
          </li>
          <li>
            <code>status=in_force</code> (default) | <code>published</code> | <code>expired</code> | <code>cancelled</code> | <code>superseded</code> | <code>all</code>
          </li>
          <li>
            <code>type=</code> one or more general types, comma-separated: {GENERAL_TYPES.map((g) => g.key).join(", ")}
          </li>
          <li>
            <code>urgency=urgent|routine</code>, <code>since=</code> (published at or after), <code>updatedSince=</code> (changed at or after), ISO 8601
          </li>
        </ul>
        {ex("/api/v1/notices?bbox=2.93,55.15,3.16,55.26")}
        {ex("/api/v1/notices?status=all&updatedSince=2026-12-01T00:00:00Z&limit=50")}
        <p>
          <code>GET /api/v1/notices/:id</code> — one notice as a Feature with every attribute: parts with positions as entered and their CRS, broadcast text,
          references.
        </p>
        {ex("/api/v1/notices/1")}
        <p className="text-sm">
          Responses carry <code>ETag</code>, <code>Last-Modified</code> and <code>Cache-Control</code>; send <code>If-None-Match</code> to get <code>304 Not Modified</code>.
          Errors are JSON <code>{`{ "error": "…", "field": "…" }`}</code> with status 400 or 404.
        </p>
      </section>
      <section className="card">
        <h2 className="text-lg font-bold">GPX and print</h2>
        <p>
          Each notice page offers its positions as GPX 1.1 (<code>/notices/:id/gpx</code>) and prints cleanly. The <Link to="/bulletin">bulletin</Link> lists
          everything in force for printing.
        </p>
      </section>
    </div>
  );
}
