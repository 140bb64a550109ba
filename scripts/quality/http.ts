// A small HTTP client for the quality suites: never follows redirects, sends same-origin Origin
// on writes unless told otherwise, and returns status, headers and body together.
export interface Reply {
  status: number;
  headers: Headers;
  text: string;
  /** Parsed JSON body, or undefined when the body is not JSON. */
  json: any;
  location: string | null;
}

export interface RequestOptions {
  method?: string;
  /** application/x-www-form-urlencoded body. */
  form?: Record<string, string> | Array<[string, string]>;
  /** JSON body. */
  json?: unknown;
  body?: BodyInit;
  cookie?: string;
  headers?: Record<string, string>;
  /** Origin header for writes: the target's own origin by default; false sends none. */
  origin?: string | false;
  timeoutMs?: number;
}

export async function request(base: string, path: string, o: RequestOptions = {}): Promise<Reply> {
  const headers = new Headers(o.headers);
  let body = o.body;
  if (o.form) {
    body = new URLSearchParams(o.form as Record<string, string>);
    headers.set("Content-Type", "application/x-www-form-urlencoded");
  } else if (o.json !== undefined) {
    body = JSON.stringify(o.json);
    headers.set("Content-Type", "application/json");
  }
  const method = o.method ?? (body !== undefined ? "POST" : "GET");
  if (o.cookie) headers.set("Cookie", o.cookie);
  if (method !== "GET" && method !== "HEAD" && o.origin !== false && !headers.has("Origin")) headers.set("Origin", o.origin ?? new URL(base).origin);
  const res = await fetch(new URL(path, base), { method, headers, body, redirect: "manual", signal: AbortSignal.timeout(o.timeoutMs ?? 30_000) });
  const text = await res.text();
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    json = undefined;
  }
  return { status: res.status, headers: res.headers, text, json, location: res.headers.get("Location") };
}

/** True when a page reply carries an error message a person can read (not a bare status). */
export function hasMessage(r: Reply): boolean {
  if (r.json && typeof r.json === "object") return typeof (r.json as { error?: unknown }).error === "string" && (r.json as { error: string }).error.length > 0;
  return r.text.length > 0;
}
