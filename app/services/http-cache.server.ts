// Validators and caching for public GETs: ETag, Last-Modified, Cache-Control, and 304 for a
// matching If-None-Match.
//
// Resource routes (API, feeds, GPX) hash their body: `cachedResponse`.
// Pages: the loader fingerprints its data (`pageCacheHeaders`) and the route's middleware
// (`conditionalGet`) answers 304 when the fingerprint still matches. Built documents carry a
// per-response CSP nonce, so the page's ETag also carries that nonce and a 304 repeats the CSP
// with the nonce of the copy the browser holds (a 304 updates the cached response's headers).
import { createHash } from "node:crypto";
import type { MiddlewareFunction } from "react-router";

export function weakTag(text: string): string {
  return createHash("sha1").update(text).digest("base64url").slice(0, 22);
}

function cacheControl(request: Request, maxAgeS: number): string {
  // Signed-in readers see their name in the header: keep their pages out of shared caches.
  const personal = request.headers.get("Cookie")?.includes("tw_session=");
  if (personal) return "private, no-cache";
  // Safety information: pages revalidate every time (cheap with the ETag); resources may be
  // reused for a few seconds.
  return maxAgeS > 0 ? `public, max-age=${maxAgeS}, stale-while-revalidate=${maxAgeS * 5}` : "public, no-cache";
}

function matches(ifNoneMatch: string | null, fingerprint: string): string | null {
  if (!ifNoneMatch) return null;
  for (const raw of ifNoneMatch.split(",")) {
    const tag = raw.trim();
    if (tag === "*") return tag;
    const inner = tag.replace(/^W\//, "").replace(/^"|"$/g, "");
    if (inner === fingerprint || inner.split(".")[0] === fingerprint) return tag;
  }
  return null;
}

/** A resource response with a body-hash ETag; 304 when the client already has it. */
export function cachedResponse(
  request: Request,
  body: string,
  opts: { contentType: string; lastModified?: Date | null; maxAgeS?: number; extraHeaders?: Record<string, string> },
): Response {
  const fingerprint = weakTag(body);
  const headers = new Headers({
    ETag: `W/"${fingerprint}"`,
    "Cache-Control": cacheControl(request, opts.maxAgeS ?? 60),
    Vary: "Accept-Encoding",
    ...opts.extraHeaders,
  });
  if (opts.lastModified) headers.set("Last-Modified", new Date(Math.floor(opts.lastModified.getTime() / 1000) * 1000).toUTCString());
  if (matches(request.headers.get("If-None-Match"), fingerprint)) return new Response(null, { status: 304, headers });
  const ims = request.headers.get("If-Modified-Since");
  if (!request.headers.has("If-None-Match") && ims && opts.lastModified && Math.floor(opts.lastModified.getTime() / 1000) * 1000 <= Date.parse(ims)) {
    return new Response(null, { status: 304, headers });
  }
  headers.set("Content-Type", opts.contentType);
  return new Response(request.method === "HEAD" ? null : body, { status: 200, headers });
}

/** Headers a page loader returns with its data: a fingerprint ETag, Last-Modified, Cache-Control. */
export function pageCacheHeaders(request: Request, fingerprintOf: unknown, opts: { lastModified?: Date | null; maxAgeS?: number; userId?: number | null } = {}) {
  const headers: Record<string, string> = {
    ETag: `W/"${weakTag(JSON.stringify(fingerprintOf) + "|" + (opts.userId ?? ""))}"`,
    "Cache-Control": cacheControl(request, opts.maxAgeS ?? 0),
  };
  if (opts.lastModified) headers["Last-Modified"] = new Date(opts.lastModified).toUTCString();
  return headers;
}

/** For a route's `headers` export: pass the loader's validators through. */
export function forwardCacheHeaders({ loaderHeaders }: { loaderHeaders: Headers }) {
  const out = new Headers();
  for (const name of ["ETag", "Last-Modified", "Cache-Control"]) {
    const v = loaderHeaders.get(name);
    if (v) out.set(name, v);
  }
  return out;
}

/** Route middleware: 304 for a page whose fingerprint matches If-None-Match. */
export const conditionalGet: MiddlewareFunction<Response> = async ({ request }, next) => {
  const res = await next();
  if ((request.method !== "GET" && request.method !== "HEAD") || res.status !== 200) return res;
  const etag = res.headers.get("ETag");
  if (!etag) return res;
  if (res.headers.has("Set-Cookie")) {
    // A one-time message (toast) rides on this response: never let it be revalidated.
    res.headers.delete("ETag");
    res.headers.set("Cache-Control", "private, no-store");
    return res;
  }
  const fingerprint = etag.replace(/^W\//, "").replace(/"/g, "");
  const csp = res.headers.get("Content-Security-Policy");
  const nonce = csp?.match(/'nonce-([^']+)'/)?.[1];
  res.headers.set("ETag", nonce ? `W/"${fingerprint}.${nonce}"` : `W/"${fingerprint}"`);
  const matched = matches(request.headers.get("If-None-Match"), fingerprint);
  if (!matched) return res;
  await res.body?.cancel().catch(() => {});
  const headers = new Headers();
  headers.set("ETag", matched);
  for (const name of ["Cache-Control", "Last-Modified", "Vary"]) {
    const v = res.headers.get(name);
    if (v) headers.set(name, v);
  }
  const oldNonce = matched.replace(/^W\//, "").replace(/"/g, "").split(".")[1];
  if (csp && nonce) headers.set("Content-Security-Policy", oldNonce ? csp.replace(`'nonce-${nonce}'`, `'nonce-${oldNonce}'`) : csp);
  return new Response(null, { status: 304, headers });
};
