import { data, type RouterContextProvider } from "react-router";
import { RateLimiterMySQL, RateLimiterRes } from "rate-limiter-flexible";
import { db } from "~/db.server";
import { env } from "~/env.server";
import { clientAddress } from "./auth.server";

/**
 * Per-address limits on anonymous writes that cost us something (storage, mail, staff time).
 * Counts live in MariaDB (rate-limiter-flexible's MySQL store over our Knex), so every app
 * instance shares them. Sign-in has its own, stricter throttle (login-throttle.server.ts).
 */
export const LIMITS = {
  report: { points: 30, durationS: 3600, what: "reports" },
  upload: { points: 120, durationS: 3600, what: "photo uploads" },
  subscribe: { points: 20, durationS: 3600, what: "subscription requests" },
} as const;
export type LimitName = keyof typeof LIMITS;

const limiters = new Map<LimitName, RateLimiterMySQL>();

function limiter(name: LimitName): RateLimiterMySQL {
  let l = limiters.get(name);
  if (!l) {
    const { points, durationS } = LIMITS[name];
    l = new RateLimiterMySQL({
      storeClient: db,
      storeType: "knex",
      dbName: env().DB_NAME,
      tableName: "rate_limits",
      tableCreated: true,
      keyPrefix: name,
      points,
      duration: durationS,
    });
    limiters.set(name, l);
  }
  return l;
}

/**
 * Consumes one point for the client's address; over the limit throws a 429 (JSON for the API,
 * the error page otherwise) with Retry-After. Unknown addresses (dev server) are not limited.
 */
export async function enforceRateLimit(name: LimitName, request: Request, context?: Readonly<RouterContextProvider>, points = 1) {
  const limited = await rateLimited(name, request, context, points);
  if (!limited) return;
  const headers = { "Retry-After": String(limited.retryAfterS) };
  if (new URL(request.url).pathname.startsWith("/api/")) throw Response.json({ error: limited.message, field: "" }, { status: 429, headers });
  throw data({ error: limited.message }, { status: 429, headers });
}

/** The same check without throwing, for forms that must keep what the user typed. */
export async function rateLimited(
  name: LimitName,
  request: Request,
  context?: Readonly<RouterContextProvider>,
  points = 1,
): Promise<{ message: string; retryAfterS: number } | null> {
  const address = clientAddress(request, context);
  if (!address) return null;
  try {
    await limiter(name).consume(address, points);
    return null;
  } catch (e) {
    if (!(e instanceof RateLimiterRes)) throw e;
    const retryAfterS = Math.max(1, Math.ceil(e.msBeforeNext / 1000));
    const minutes = Math.ceil(retryAfterS / 60);
    return { retryAfterS, message: `Too many ${LIMITS[name].what} from your network. Try again in ${minutes} minute${minutes === 1 ? "" : "s"}, or call the harbour office.` };
  }
}
