import { randomBytes } from "node:crypto";
import { PassThrough } from "node:stream";
import { createReadableStreamFromReadable } from "@react-router/node";
import { renderToPipeableStream } from "react-dom/server";
import type { EntryContext, HandleErrorFunction, RouterContextProvider } from "react-router";
import { ServerRouter } from "react-router";
import { NonceContext } from "./components/nonce";
import { isDbUnavailable } from "./db.server";
import { cachedDocument, documentCache, documentCacheKey, documentVariant, registerDocumentCsp } from "./services/http-cache.server";
import { documentCsp } from "./services/security.server";

registerDocumentCsp((nonce) => documentCsp(nonce, false));

export const streamTimeout = 5_000;

export default function handleRequest(
  request: Request,
  responseStatusCode: number,
  responseHeaders: Headers,
  routerContext: EntryContext,
  _loadContext: RouterContextProvider,
) {
  const nonce = randomBytes(16).toString("base64");
  const isDev = process.env.NODE_ENV !== "production";
  // Vite's dev client injects inline scripts; the strict policy applies to built apps.
  if (!isDev) responseHeaders.set("Content-Security-Policy", documentCsp(nonce, isDev));
  // The 503 page (database unreachable) tells clients and proxies when to retry and not to cache.
  if (responseStatusCode === 503) {
    responseHeaders.set("Retry-After", "10");
    responseHeaders.set("Cache-Control", "no-store");
  }
  const readyOption = routerContext.isSpaMode ? "onAllReady" : documentVariant(request);
  // An anonymous public page (validatedPage): kept, so the next reader of the same fingerprint
  // gets these bytes with a nonce of its own without any rendering.
  const cacheKey = isDev ? null : documentCacheKey(request, responseStatusCode, responseHeaders);
  return new Promise<Response>((resolve, reject) => {
    let shellRendered = false;
    const { pipe, abort } = renderToPipeableStream(
      <NonceContext.Provider value={nonce}>
        <ServerRouter context={routerContext} url={request.url} nonce={nonce} />
      </NonceContext.Provider>,
      {
        nonce,
        [readyOption]() {
          shellRendered = true;
          const body = new PassThrough();
          if (cacheKey) {
            const chunks: Buffer[] = [];
            body.on("data", (c: Buffer) => chunks.push(c));
            body.on("end", () => {
              if (responseStatusCode !== 200) return;
              const headers = [...responseHeaders].filter(([name]) => name !== "content-security-policy" && name !== "etag");
              documentCache.set(cacheKey, cachedDocument(Buffer.concat(chunks).toString("utf8"), nonce, headers));
            });
          }
          const stream = createReadableStreamFromReadable(body);
          responseHeaders.set("Content-Type", "text/html; charset=utf-8");
          resolve(new Response(stream, { headers: responseHeaders, status: responseStatusCode }));
          pipe(body);
        },
        onShellError(error: unknown) {
          reject(error);
        },
        onError(error: unknown) {
          responseStatusCode = 500;
          if (shellRendered) console.error(error);
        },
      },
    );
    setTimeout(abort, streamTimeout + 1000);
  });
}

export const handleError: HandleErrorFunction = (error, { request }) => {
  if (request.signal.aborted) return;
  if (isDbUnavailable(error)) {
    console.error(`[db] unavailable while serving ${new URL(request.url).pathname}`);
    return;
  }
  console.error(error);
};
