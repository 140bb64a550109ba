import { db } from "~/db.server";

/** Liveness and database reachability, for load balancers and the start script. */
export async function loader() {
  const started = performance.now();
  try {
    await db.raw("SELECT 1");
    return Response.json(
      { status: "ok", database: "ok", databaseMs: Math.round((performance.now() - started) * 10) / 10 },
      { headers: { "Cache-Control": "no-store" } },
    );
  } catch {
    return Response.json({ status: "degraded", database: "unavailable" }, { status: 503, headers: { "Cache-Control": "no-store", "Retry-After": "10" } });
  }
}
