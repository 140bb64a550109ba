import { beforeAll, describe, expect, it } from "vitest";
import { seed as seedHarbour } from "../../seeds/02_harbour";
import { db } from "~/db.server";
import * as apiReports from "~/routes/api.v1.reports";
import { LIMITS } from "~/services/rate-limit.server";
import { call } from "../support/routes";

describe("rate limits on anonymous writes", () => {
  beforeAll(async () => {
    if (!(await db("harbours").first())) await seedHarbour(db);
  });

  it("answers 429 with Retry-After after the per-address limit, shared through the database", async () => {
    const address = `198.51.100.${Math.floor(Math.random() * 200) + 1}`;
    const post = () =>
      call(apiReports.action, { path: "/api/v1/reports", address, method: "POST", body: "{}", headers: { "Content-Type": "application/json" } });
    for (let i = 0; i < LIMITS.report.points; i++) expect((await post()).status).not.toBe(429);
    const limited = await post();
    expect(limited.status).toBe(429);
    expect(limited.data.error).toMatch(/Too many reports from your network/);
    expect(Number(limited.headers.get("Retry-After"))).toBeGreaterThan(0);
    const row = await db("rate_limits").where({ key: `report:${address}` }).first();
    expect(row.points).toBeGreaterThan(LIMITS.report.points);
    // Another address is not affected.
    const other = await call(apiReports.action, { path: "/api/v1/reports", address: "192.0.2.1", method: "POST", body: "{}", headers: { "Content-Type": "application/json" } });
    expect(other.status).toBe(400); // refused for its empty body, not for its address
  });
});
