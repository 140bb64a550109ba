import knex, { type Knex } from "knex";
import { data } from "react-router";
import { env, type Env } from "./env.server";

export type Db = Knex | Knex.Transaction;

declare global {
  // Survives dev-server module reloads so we do not leak pools.
  var __tidewireDb: Knex | undefined;
}

const CONNECTION_ERROR_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "ETIMEDOUT",
  "EPIPE",
  "PROTOCOL_CONNECTION_LOST",
  "ER_SERVER_SHUTDOWN",
  "ER_CON_COUNT_ERROR",
  "ENOTFOUND",
]);

/** True when an error means "the database cannot be reached", not "the query was wrong". */
export function isDbUnavailable(error: unknown): boolean {
  if (!error || typeof error !== "object") return false;
  const e = error as { code?: string; name?: string; message?: string };
  if (e.code && CONNECTION_ERROR_CODES.has(e.code)) return true;
  if (e.name === "KnexTimeoutError") return true;
  return /connect ECONNREFUSED|Connection lost|Pool is closed|connection is in closed state/i.test(e.message ?? "");
}

/** The thrown response for a database outage: rendered as the 503 page or a JSON 503. */
export function serviceUnavailable() {
  return data(
    { error: "The notice service is temporarily unavailable. Please try again in a minute." },
    { status: 503, headers: { "Retry-After": "10", "Cache-Control": "no-store" } },
  );
}

const PATCHED = Symbol.for("tidewire.db.outage-translation");

/**
 * Translates outages into a 503 wherever a query is awaited (loaders, actions, API), so a
 * stopped database gives the 503 page and the app recovers by itself when it returns. The
 * client's prototype is patched, not the instance: Knex builds each transaction's client from
 * the prototype, and queries inside transactions must be translated too.
 */
function translateOutages(instance: Knex) {
  type Patchable = { acquireConnection: (...a: unknown[]) => Promise<unknown>; query: (...a: unknown[]) => Promise<unknown>; [PATCHED]?: true };
  const proto = Object.getPrototypeOf(instance.client) as Patchable;
  if (proto[PATCHED]) return;
  proto[PATCHED] = true;
  for (const method of ["acquireConnection", "query"] as const) {
    const original = proto[method];
    proto[method] = async function (this: unknown, ...args: unknown[]) {
      try {
        return await original.apply(this, args);
      } catch (error) {
        if (isDbUnavailable(error)) throw serviceUnavailable();
        throw error;
      }
    };
  }
}

export function createDb(e: Env): Knex {
  const instance = knex({
    client: "mysql2",
    connection: {
      host: e.DB_HOST,
      port: e.DB_PORT,
      user: e.DB_USER,
      password: e.DB_PASSWORD,
      database: e.DB_NAME,
      timezone: "Z",
      dateStrings: false,
      supportBigNumbers: true,
      connectTimeout: 2000,
    },
    pool: { min: 0, max: e.DB_POOL_MAX, acquireTimeoutMillis: 3000 },
    acquireConnectionTimeout: 3000,
  });
  translateOutages(instance);
  return instance;
}

export const db: Knex = (globalThis.__tidewireDb ??= createDb(env()));
