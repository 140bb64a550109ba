// Calling route modules' loaders and actions directly with real Request objects, against the
// real test database. Thrown responses (redirects, 403/404 data) are caught and normalised.
import { RouterContextProvider } from "react-router";
import { clientAddressContext } from "~/context";
import { createUser } from "~/models/user.server";
import type { Role } from "~/lib/permissions";
import { commitSession, sessionStorage } from "~/services/session.server";

export const BASE = "http://127.0.0.1:3000";

export type RouteResult = { status: number; headers: Headers; data: any; location: string | null };

// Route args carry typed params and more; tests pass the parts a handler reads.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Handler = (args: any) => unknown;

async function normalise(value: unknown): Promise<RouteResult> {
  if (value instanceof Response) {
    const text = await value.text();
    let data: unknown = text;
    try {
      data = JSON.parse(text);
    } catch {
      /* not JSON */
    }
    return { status: value.status, headers: value.headers, data, location: value.headers.get("Location") };
  }
  if (value && typeof value === "object" && (value as { type?: string }).type === "DataWithResponseInit") {
    const v = value as { data: unknown; init: ResponseInit | null };
    const headers = new Headers(v.init?.headers);
    return { status: v.init?.status ?? 200, headers, data: v.data, location: headers.get("Location") };
  }
  return { status: 200, headers: new Headers(), data: value, location: null };
}

export async function call(
  handler: Handler | undefined,
  opts: { path: string; address?: string; method?: string; form?: Record<string, string>; body?: BodyInit; cookie?: string; params?: Record<string, string>; headers?: Record<string, string> },
): Promise<RouteResult> {
  if (!handler) throw new Error(`no handler for ${opts.path}`);
  const headers = new Headers(opts.headers);
  if (opts.cookie) headers.set("Cookie", opts.cookie);
  let body: BodyInit | undefined = opts.body;
  if (opts.form) {
    body = new URLSearchParams(opts.form);
    headers.set("Content-Type", "application/x-www-form-urlencoded");
  }
  const request = new Request(BASE + opts.path, { method: opts.method ?? (body ? "POST" : "GET"), headers, body });
  try {
    const context = new RouterContextProvider();
    if (opts.address) context.set(clientAddressContext, opts.address);
    return await normalise(await handler({ request, params: opts.params ?? {}, context }));
  } catch (thrown) {
    if (thrown instanceof Error) throw thrown;
    return normalise(thrown);
  }
}

/** The cookie header value from a response's Set-Cookie headers (last one wins per name). */
export function cookieFrom(headers: Headers, previous = ""): string {
  const jar = new Map<string, string>();
  for (const part of previous.split(/;\s*/).filter(Boolean)) {
    const [k, ...v] = part.split("=");
    jar.set(k, v.join("="));
  }
  for (const line of headers.getSetCookie()) {
    const [pair] = line.split(";");
    const [k, ...v] = pair.split("=");
    if (/expires=Thu, 01 Jan 1970/i.test(line) || v.join("=") === "") jar.delete(k);
    else jar.set(k, v.join("="));
  }
  return [...jar].map(([k, v]) => `${k}=${v}`).join("; ");
}

let counter = 0;
/** A verified user of the role with a live session; returns the cookie to send. */
export async function signedInAs(role: Role, name = `${role} tester`) {
  counter += 1;
  const user = await createUser({ email: `${role}-${Date.now()}-${counter}@test.example`, name, role, password: "correct horse battery", verified: true });
  return { user, cookie: await sessionCookieFor(user.id) };
}

/** A fresh session for an existing user, as the Cookie header value. */
export async function sessionCookieFor(userId: number): Promise<string> {
  const session = await sessionStorage().getSession();
  session.set("userId", userId);
  return (await commitSession(session)).split(";")[0];
}
