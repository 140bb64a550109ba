import { data, type MiddlewareFunction } from "react-router";
import { env } from "~/env.server";

const UNSAFE_METHODS = new Set(["POST", "PUT", "PATCH", "DELETE"]);

/**
 * Refuses cross-origin writes (CSRF): a browser always sends Origin on a cross-site POST, and
 * Sec-Fetch-Site where Origin is stripped. Clients that are not browsers send neither and are
 * judged by their own credentials (the API routes need none beyond the request itself).
 */
export function isCrossOriginWrite(request: Request): boolean {
  if (!UNSAFE_METHODS.has(request.method)) return false;
  const origin = request.headers.get("Origin");
  if (origin) {
    if (origin === "null") return true;
    const allowed = new Set([new URL(request.url).origin, new URL(env().APP_URL).origin]);
    return !allowed.has(origin);
  }
  return request.headers.get("Sec-Fetch-Site") === "cross-site";
}

/** Headers every response carries; the document CSP (with its nonce) is set in entry.server. */
export function applySecurityHeaders(headers: Headers) {
  headers.set("X-Content-Type-Options", "nosniff");
  headers.set("Referrer-Policy", "strict-origin-when-cross-origin");
  headers.set("X-Frame-Options", "DENY");
  headers.set("Cross-Origin-Opener-Policy", "same-origin");
  headers.set("Permissions-Policy", "camera=(), microphone=(), geolocation=(self), payment=()");
  if (!headers.has("Content-Security-Policy")) {
    headers.set("Content-Security-Policy", "default-src 'none'; frame-ancestors 'none'; sandbox");
  }
  if (env().NODE_ENV === "production" && new URL(env().APP_URL).protocol === "https:") {
    headers.set("Strict-Transport-Security", "max-age=31536000; includeSubDomains");
  }
}

export const securityMiddleware: MiddlewareFunction<Response> = async ({ request }, next) => {
  if (isCrossOriginWrite(request)) {
    const url = new URL(request.url);
    if (url.pathname.startsWith("/api/")) {
      const res = Response.json({ error: "Cross-origin request refused.", field: "Origin" }, { status: 403 });
      applySecurityHeaders(res.headers);
      return res;
    }
    throw data({ error: "This form was sent from another site and has been refused." }, { status: 403 });
  }
  const response = await next();
  applySecurityHeaders(response.headers);
  return response;
};

/** The document Content-Security-Policy: scripts only with this response's nonce. */
export function documentCsp(nonce: string, isDev: boolean): string {
  const tileOrigin = env().MAP_TILE_URL ? new URL(env().MAP_TILE_URL!.replace(/\{[a-z]\}/gi, "0")).origin : "";
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}'${isDev ? " 'unsafe-eval'" : ""}`,
    // React's style props render as attributes; no inline <style> blocks are emitted.
    "style-src 'self' 'unsafe-inline'",
    `img-src 'self' data: blob:${tileOrigin ? " " + tileOrigin : ""}`,
    `connect-src 'self'${isDev ? " ws: wss:" : ""}`,
    "font-src 'self'",
    "object-src 'none'",
    "base-uri 'none'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}
