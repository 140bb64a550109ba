// Validators and caching for public GETs: ETag, Last-Modified, Cache-Control, and 304 for a
// matching If-None-Match.
//
// Resource routes (API, feeds, GPX) hash their body: `cachedResponse`.
// Pages: the loader fingerprints its data (`pageCacheHeaders`) and the route's middleware
// (`conditionalGet`) answers 304 when the fingerprint still matches — or, for the public pages
// read most, a cheap validator runs before any loader (`validatedPage`, below). Built documents carry a
// per-response CSP nonce, so the page's ETag also carries that nonce and a 304 repeats the CSP
// with the nonce of the copy the browser holds (a 304 updates the cached response's headers).
import { createHash, randomBytes } from "node:crypto";
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { isbot } from "isbot";
import { LRUCache } from "lru-cache";
import { createContext, type MiddlewareFunction, type RouterContextProvider } from "react-router";
import { REQUEST_KIND_HEADER } from "~/context";
import { getOptionalUser } from "./auth.server";
import { getSession } from "./session.server";

export function weakTag(text: string): string {
  return createHash("sha1").update(text).digest("base64url").slice(0, 22);
}

/** Pages differ for signed-in readers (their name, their links) under the same URL. */
const PAGE_VARY = "Cookie, Accept-Encoding";

function hasSession(request: Request): boolean {
  return request.headers.get("Cookie")?.includes("tw_session=") ?? false;
}

/** `W/"fingerprint.nonce"` → `fingerprint.nonce`. */
function tagValue(tag: string): string {
  return tag.replace(/^W\//, "").replace(/"/g, "");
}

function cacheControl(request: Request, maxAgeS: number): string {
  // Signed-in readers see their name in the header: keep their pages out of shared caches.
  if (hasSession(request)) return "private, no-cache";
  // Safety information: pages revalidate every time (cheap with the ETag); resources may be
  // reused for a few seconds.
  return maxAgeS > 0 ? `public, max-age=${maxAgeS}, stale-while-revalidate=${maxAgeS * 5}` : "public, no-cache";
}

function matches(ifNoneMatch: string | null, fingerprint: string): string | null {
  if (!ifNoneMatch) return null;
  for (const raw of ifNoneMatch.split(",")) {
    const tag = raw.trim();
    if (tag === "*") return tag;
    const inner = tagValue(tag);
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
    Vary: PAGE_VARY,
  };
  if (opts.lastModified) headers["Last-Modified"] = new Date(opts.lastModified).toUTCString();
  return headers;
}

/** For a route's `headers` export: pass the loader's validators through. */
export function forwardCacheHeaders({ loaderHeaders }: { loaderHeaders: Headers }) {
  const out = new Headers();
  for (const name of ["ETag", "Last-Modified", "Cache-Control", "Vary"]) {
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
  const fingerprint = tagValue(etag);
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
  const oldNonce = tagValue(matched).split(".")[1];
  if (csp && nonce) headers.set("Content-Security-Policy", oldNonce ? csp.replace(`'nonce-${nonce}'`, `'nonce-${oldNonce}'`) : csp);
  return new Response(null, { status: 304, headers });
};

// ---------------------------------------------------------------------------------------------
// Validated pages: a cheap validator before the loader's queries, and caches keyed by it.
//
// `validatedPage(compute)` is a route middleware. `compute` returns what the page depends on
// from one cheap query (e.g. publicRevision(): tokens the database replaces on every write, and
// the last lapse by the clock). Its fingerprint — with the build, the URL and the signed-in
// user — is the page's ETag, so a client or proxy holding the current copy gets a 304 without
// any of the page's real work. The loader reuses a payload built for the same fingerprint
// (`memoPayload`) and entry.server reuses the rendered HTML of an anonymous page for it
// (`documentCache`), giving each copy a fresh CSP nonce. Correctness rests on `compute`
// covering everything the page shows; the fingerprint is checked on every request, so no copy
// outlives a change.

/** Changes with every build: a copy rendered by other code is never reused. */
const BUILD_ID = (() => {
  try {
    return weakTag(readFileSync(fileURLToPath(import.meta.url)).toString("latin1"));
  } catch {
    return "unknown-build";
  }
})();

const DEV = process.env.NODE_ENV === "development";

export const pageFingerprintContext = createContext<string | null>(null);

export function validatedPage(compute: (args: { request: Request; params: Record<string, string | undefined> }) => Promise<unknown>): MiddlewareFunction<Response> {
  return async (args, next) => {
    const { request, context } = args;
    // The dev server reloads code under a running process: a fingerprint without the code in it
    // would answer 304 (or reuse a payload) across an edit. Pages there are always built afresh.
    if (DEV) return next();
    if (request.method !== "GET" && request.method !== "HEAD") return conditionalGet(args, next);
    const signedIn = hasSession(request);
    const [user, session] = signedIn ? await Promise.all([getOptionalUser(request), getSession(request)]) : [null, null];
    // A one-time message waits in the session: render the page so it is shown (and consumed).
    const toastWaiting = Boolean(session?.get("toast"));
    const url = new URL(request.url);
    const fingerprint = weakTag(JSON.stringify([BUILD_ID, url.pathname, url.search, user?.id ?? null, await compute(args)]));
    context.set(pageFingerprintContext, fingerprint);
    const matched = matches(request.headers.get("If-None-Match"), fingerprint);
    if (matched && !toastWaiting) {
      const headers = new Headers({ ETag: matched, "Cache-Control": cacheControl(request, 0), Vary: PAGE_VARY });
      // The copy the browser keeps carries its own nonce; a 304 replaces the stored headers it
      // names, so it repeats the policy with that nonce.
      const oldNonce = tagValue(matched).split(".")[1];
      if (oldNonce && process.env.NODE_ENV === "production") headers.set("Content-Security-Policy", documentCspFor(oldNonce));
      return new Response(null, { status: 304, headers });
    }
    if (!signedIn && isDocumentRequest(request)) {
      const hit = documentCache.get(keyFor(request, fingerprint));
      if (hit) return replayDocument(request, hit, fingerprint);
    }
    return conditionalGet(args, next);
  };
}

// entry.server sets the document policy; the 304 above needs the same text for another nonce.
let documentCspFor: (nonce: string) => string = () => "";
export function registerDocumentCsp(fn: (nonce: string) => string) {
  documentCspFor = fn;
}

// Bounded by entries and by an estimate of size (twice the JSON length), so many distinct URLs
// (every filter of the notices list, a crawler) cannot grow it without limit.
const payloads = new LRUCache<string, { value: unknown; size: number }>({ max: 500, maxSize: 48 * 1024 * 1024, sizeCalculation: (v) => v.size, ttl: 15 * 60_000 });

/** The fingerprint validatedPage set for this request; null outside it (dev server, tests calling loaders). */
function fingerprintOf(context: Readonly<RouterContextProvider> | undefined): string | null {
  try {
    return context?.get(pageFingerprintContext) ?? null;
  } catch {
    return null;
  }
}

/** The loader's payload for this request's fingerprint, built once per fingerprint. */
export async function memoPayload<T>(context: Readonly<RouterContextProvider>, build: () => Promise<T>): Promise<T> {
  const fingerprint = fingerprintOf(context);
  if (!fingerprint) return build();
  const hit = payloads.get(fingerprint);
  if (hit) return hit.value as T;
  const value = await build();
  payloads.set(fingerprint, { value, size: (JSON.stringify(value)?.length ?? 0) * 2 + 256 });
  return value;
}

/** Validator headers for a page under `validatedPage`: its fingerprint is the ETag. */
export function validatedHeaders(request: Request, context: Readonly<RouterContextProvider>, opts: { lastModified?: Date | null } = {}) {
  const fingerprint = fingerprintOf(context);
  const headers: Record<string, string> = { "Cache-Control": cacheControl(request, 0), Vary: PAGE_VARY };
  if (fingerprint) headers.ETag = `W/"${fingerprint}"`;
  if (opts.lastModified) headers["Last-Modified"] = new Date(opts.lastModified).toUTCString();
  return headers;
}

/**
 * Rendered documents of anonymous public pages, by URL, fingerprint and variant, with the nonce
 * they were rendered with (replaced by each response's own) and their headers. Bounded by size.
 */
export type CachedDocument = {
  /** The document's bytes between the occurrences of its nonce (kept as bytes: no re-encoding per copy). */
  parts: Buffer[];
  headers: Array<[string, string]>;
};
export const documentCache = new LRUCache<string, CachedDocument>({
  maxSize: 64 * 1024 * 1024,
  sizeCalculation: (v) => v.parts.reduce((n, p) => n + p.length, 512),
  ttl: 15 * 60_000,
});

export function cachedDocument(html: string, nonce: string, headers: Array<[string, string]>): CachedDocument {
  return { parts: html.split(nonce).map((p) => Buffer.from(p, "utf8")), headers };
}

/** Crawlers and no-JS clients get the whole document at once (entry.server): another copy. */
export function documentVariant(request: Request): "onAllReady" | "onShellReady" {
  const userAgent = request.headers.get("user-agent");
  return userAgent && isbot(userAgent) ? "onAllReady" : "onShellReady";
}

/** The document cache key for a rendered response, or null when it was for this reader alone. */
export function documentCacheKey(request: Request, status: number, headers: Headers): string | null {
  if (status !== 200 || (request.method !== "GET" && request.method !== "HEAD") || !isDocumentRequest(request)) return null;
  const etag = headers.get("ETag");
  if (!etag || headers.has("Set-Cookie") || !headers.get("Cache-Control")?.startsWith("public") || hasSession(request)) return null;
  return keyFor(request, tagValue(etag));
}

function keyFor(request: Request, fingerprint: string): string {
  return `${documentVariant(request)}|${request.url}|${fingerprint}`;
}

/** A page itself, as told by scripts/serve.ts (React Router's data requests share its URL). */
function isDocumentRequest(request: Request): boolean {
  return process.env.NODE_ENV === "production" && request.headers.get(REQUEST_KIND_HEADER) === "document";
}

function replayDocument(request: Request, cached: CachedDocument, fingerprint: string): Response {
  const nonce = randomBytes(16).toString("base64");
  const headers = new Headers(cached.headers);
  headers.set("Content-Security-Policy", documentCspFor(nonce));
  headers.set("ETag", `W/"${fingerprint}.${nonce}"`);
  headers.set("X-Tidewire-Render", "cached");
  if (request.method === "HEAD") return new Response(null, { status: 200, headers });
  const nonceBytes = Buffer.from(nonce, "utf8");
  const chunks: Buffer[] = [];
  cached.parts.forEach((p, i) => (i ? chunks.push(nonceBytes, p) : chunks.push(p)));
  return new Response(Buffer.concat(chunks), { status: 200, headers });
}

const resourceBodies = new LRUCache<string, { body: string; lastModified: Date | null; headers: Record<string, string> }>({
  maxSize: 32 * 1024 * 1024,
  sizeCalculation: (v) => v.body.length * 2 + 256,
  ttl: 15 * 60_000,
});

/**
 * A public resource (API, feed) with the same validator as the pages: `dependsOn` comes from one
 * cheap query (e.g. publicRevision()); with the build and the URL it is the ETag, so a
 * revalidation is answered before `build` runs any query, and a body built for the same
 * fingerprint is reused. `headers` go on every answer (e.g. CORS); `build` may add its own.
 */
export async function validatedResource(
  request: Request,
  dependsOn: unknown,
  build: () => Promise<{ body: string; lastModified?: Date | null; headers?: Record<string, string> }>,
  opts: { contentType: string; maxAgeS?: number; headers?: Record<string, string> },
): Promise<Response> {
  if (DEV) {
    const built = await build();
    return cachedResponse(request, built.body, { contentType: opts.contentType, maxAgeS: opts.maxAgeS, lastModified: built.lastModified, extraHeaders: { ...opts.headers, ...built.headers } });
  }
  const url = new URL(request.url);
  const fingerprint = weakTag(JSON.stringify([BUILD_ID, url.pathname, url.search, dependsOn]));
  const headers = new Headers({ ETag: `W/"${fingerprint}"`, "Cache-Control": cacheControl(request, opts.maxAgeS ?? 60), Vary: "Accept-Encoding", ...opts.headers });
  if (matches(request.headers.get("If-None-Match"), fingerprint)) return new Response(null, { status: 304, headers });
  let entry = resourceBodies.get(fingerprint);
  if (!entry) {
    const built = await build();
    entry = { body: built.body, lastModified: built.lastModified ?? null, headers: built.headers ?? {} };
    resourceBodies.set(fingerprint, entry);
  }
  for (const [k, v] of Object.entries(entry.headers)) headers.set(k, v);
  if (entry.lastModified) headers.set("Last-Modified", new Date(Math.floor(entry.lastModified.getTime() / 1000) * 1000).toUTCString());
  headers.set("Content-Type", opts.contentType);
  return new Response(request.method === "HEAD" ? null : entry.body, { status: 200, headers });
}
