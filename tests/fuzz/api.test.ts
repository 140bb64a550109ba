// Property-based tests over every API route, over HTTP against the production build: hostile
// query strings, path ids and JSON bodies (mutations of a valid body, any JSON, wrong types,
// non-JSON bodies). Always a 2xx or a 4xx JSON { error } naming the problem, never a 500; a
// refused write stores nothing. FUZZ_RUNS sets the number of runs per property.
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import routes from "~/routes";
import { closeQdb, qdb } from "../../scripts/quality/db";
import { check, hostileJson, hostileString, mutationsOf, RUNS } from "../../scripts/quality/hostile";
import { request, type Reply } from "../../scripts/quality/http";
import { createAccount, sessionCookie } from "../../scripts/quality/people";
import { forgetRateLimits, rowCounts } from "./invariants";

const base = () => process.env.QUALITY_BASE_URL!;

// A valid assessment (charted buoy, one GNSS fix 20 m away): the seed of the mutations.
const ASSESSMENT = {
  charted: { position: "55°12.300′N 005°01.100′W", crs: "EPSG:4326" },
  swingRadiusM: 30,
  observations: [{ method: "gnss", position: "55°12.310′N 005°01.110′W", accuracyM: 5, observedAt: "2026-11-20T14:05:00Z" }],
};

/** GET API routes and the query parameters they understand (hostile values are drawn for them). */
const GET_APIS: Record<string, string[]> = {
  "/api/v1/notices": ["bbox", "status", "type", "urgency", "since", "updatedSince", "limit", "cursor", "format"],
  "/api/v1/aids": ["withdrawn", "bbox", "status", "code"],
  "/api/v1/convert": ["position", "from", "to", "fromTransformation", "toTransformation"],
  "/api/v1/measure": ["from", "to", "crs", "position", "a", "b"],
};
/** API routes with a path parameter. */
const ID_APIS = ["/api/v1/notices/"];
/** POST API routes with JSON bodies. */
const POST_APIS: Record<string, unknown> = {
  "/api/v1/assessments": ASSESSMENT,
  "/api/v1/uploads": { contentType: "image/jpeg" },
  "/api/v1/reports": {
    aid: "KS3",
    observation: { method: "gnss", position: "55°12.310′N 005°01.110′W", accuracyM: 5 },
    observedAt: "2026-11-30T14:05:00Z",
    remarks: "Buoy appears off station",
    reporter: { email: "skipper@boaters.example", name: "Test Skipper", vessel: "Kittiwake" },
  },
};

function jsonMessage(r: Reply): boolean {
  return /^application\/json/.test(r.headers.get("content-type") ?? "") && typeof r.json?.error === "string" && r.json.error.length > 0;
}

let cookie = "";
beforeAll(async () => {
  const a = await createAccount(qdb(), "boater");
  cookie = await sessionCookie(qdb(), process.env.SESSION_SECRET!, a.id);
});
afterAll(closeQdb);

type RouteEntry = { path?: string; file: string; children?: RouteEntry[] };
const apiPaths = (entries: RouteEntry[]): string[] => entries.flatMap((e) => [...(e.path?.startsWith("api/") ? ["/" + e.path] : []), ...apiPaths(e.children ?? [])]);

describe("API routes under hostile input", () => {
  it("every API route in app/routes.ts is fuzzed here", () => {
    const known = new Set([...Object.keys(GET_APIS), ...Object.keys(POST_APIS), ...ID_APIS.map((p) => p + ":id"), "/api/v1/uploads/:id/complete"]);
    expect(apiPaths(routes as RouteEntry[]).filter((p) => !known.has(p))).toEqual([]);
  });

  for (const [path, params] of Object.entries(GET_APIS)) {
    it(`GET ${path}`, async () => {
      const query = fc.array(fc.tuple(fc.oneof(fc.constantFrom(...params), hostileString.map((s) => s.slice(0, 30))), hostileString), { minLength: 1, maxLength: 4 });
      await check(
        fc.asyncProperty(query, async (pairs) => {
          // Node refuses request lines over 16 kB itself (431, tested below); stay under it here.
          const qs = new URLSearchParams(pairs.map(([k, v]) => [k, v])).toString().slice(0, 8000).replace(/%[0-9A-F]?$/i, "");
          const r = await request(base(), `${path}?${qs}`, { cookie });
          const what = `GET ${path}?${qs.slice(0, 300)} → ${r.status} ${r.text.slice(0, 300)}`;
          expect(r.status, what).toBeLessThan(500);
          if (r.status === 404 && !jsonMessage(r)) throw new Error(`route missing? ${what}`);
          if (r.status >= 400) expect(jsonMessage(r), what).toBe(true);
        }),
        { numRuns: RUNS * 2 },
      );
    });
  }

  for (const prefix of ID_APIS) {
    it(`GET ${prefix}:id`, async () => {
      await check(
        fc.asyncProperty(fc.oneof(hostileString, fc.integer().map(String), fc.constantFrom("0", "-1", "1.5", "99999999999", "1e3", "0x10")), async (id) => {
          // Under Node's own 16 kB request-line limit (that case is tested on its own below).
          const r = await request(base(), prefix + encodeURIComponent(id).slice(0, 8000).replace(/%[0-9A-F]?$/i, ""), { cookie });
          const what = `GET ${prefix}${id.slice(0, 60)} → ${r.status} ${r.text.slice(0, 200)}`;
          expect(r.status, what).toBeLessThan(500);
          if (r.status >= 400) expect(jsonMessage(r), what).toBe(true);
        }),
        { numRuns: RUNS * 2 },
      );
    });
  }

  for (const [path, valid] of Object.entries(POST_APIS)) {
    it(`POST ${path}`, async () => {
      const body = fc.oneof({ arbitrary: mutationsOf(valid as never), weight: 3 }, { arbitrary: hostileJson, weight: 1 });
      await check(
        fc.asyncProperty(body, async (b) => {
          await forgetRateLimits(qdb());
          const before = await rowCounts(qdb());
          const r = await request(base(), path, { json: b, cookie });
          const what = `POST ${path} ${JSON.stringify(b).slice(0, 400)} → ${r.status} ${r.text.slice(0, 300)}`;
          expect(r.status, what).toBeLessThan(500);
          if (r.status >= 400) {
            expect(jsonMessage(r), what).toBe(true);
            expect(await rowCounts(qdb()), `refused but stored: ${what}`).toEqual(before);
          }
        }),
        { numRuns: RUNS * 3 },
      );
    });

    it(`POST ${path}: bodies that are not JSON`, async () => {
      const cases: Array<[string, BodyInit]> = [
        ["text/plain", "hello"],
        ["application/json", "{\"charted\":"],
        ["application/json", "\u0000\u0001"],
        ["application/json", "[" .repeat(5000) + "]".repeat(5000)],
        ["application/json", JSON.stringify({ a: "x".repeat(300_000) })],
        ["application/x-www-form-urlencoded", "a=1&b=2"],
        ["multipart/form-data; boundary=zz", "--zz\r\nContent-Disposition: form-data; name=\"a\"\r\n\r\n1"],
        ["application/json; charset=utf-16", "{}"],
      ];
      for (const [type, body] of cases) {
        const r = await request(base(), path, { method: "POST", body, headers: { "Content-Type": type }, cookie });
        const what = `POST ${path} (${type}) → ${r.status} ${r.text.slice(0, 200)}`;
        expect(r.status, what).toBeGreaterThanOrEqual(400);
        expect(r.status, what).toBeLessThan(500);
        expect(jsonMessage(r), what).toBe(true);
      }
    });
  }

  it("an over-long URL is refused by the server (414/431), not a 500", async () => {
    const r = await request(base(), `/api/v1/notices?bbox=${"9".repeat(40_000)}`);
    expect([414, 431]).toContain(r.status);
  });

  it("methods an API route does not support get a JSON 405 (or 404), never a 500", async () => {
    for (const path of [...Object.keys(GET_APIS), ...Object.keys(POST_APIS)]) {
      for (const method of ["PUT", "PATCH", "DELETE"]) {
        const r = await request(base(), path, { method, json: {}, cookie });
        const what = `${method} ${path} → ${r.status} ${r.text.slice(0, 200)}`;
        expect(r.status, what).toBeLessThan(500);
        expect(r.status, what).toBeGreaterThanOrEqual(400);
      }
    }
  });
});
