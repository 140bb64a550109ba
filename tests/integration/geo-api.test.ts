// The position API through its route modules with real Request objects: every documented
// example (README and tests/integration/geo-api-examples.md) is replayed and must give the
// documented response, and no input — however malformed — may produce a 500.
import { existsSync, readFileSync } from "node:fs";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import * as assessRoute from "~/routes/api.v1.assessments";
import * as convertRoute from "~/routes/api.v1.convert";
import * as measureRoute from "~/routes/api.v1.measure";
import { EXAMPLES, parseExamplesMarkdown } from "./geo-api-examples";

const BASE = "http://127.0.0.1:3000";
type Args = { request: Request; params: Record<string, string>; context: unknown };

async function send(method: string, path: string, body?: string, headers: Record<string, string> = {}) {
  const request = new Request(BASE + path, { method, headers, body });
  const args = { request, params: {}, context: {} } as Args;
  const mod = path.startsWith("/api/v1/convert") ? convertRoute : path.startsWith("/api/v1/measure") ? measureRoute : assessRoute;
  const handler = method === "GET" ? mod.loader : (mod as typeof assessRoute).action;
  const res = (await (handler as (a: Args) => Promise<Response> | Response)(args)) as Response;
  const text = await res.text();
  let json: unknown = null;
  try {
    json = JSON.parse(text);
  } catch {
    json = text;
  }
  return { status: res.status, headers: res.headers, json };
}

/** Deep equality, numbers to 1e-9 relative (documented figures are printed unrounded). */
function expectSame(actual: unknown, expected: unknown, path = "$"): void {
  if (typeof expected === "number") {
    expect(typeof actual, path).toBe("number");
    expect(Math.abs((actual as number) - expected), path).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(expected)));
    return;
  }
  if (Array.isArray(expected)) {
    expect(Array.isArray(actual), path).toBe(true);
    expect((actual as unknown[]).length, path).toBe(expected.length);
    expected.forEach((e, i) => expectSame((actual as unknown[])[i], e, `${path}[${i}]`));
    return;
  }
  if (expected && typeof expected === "object") {
    expect(actual && typeof actual === "object", path).toBeTruthy();
    expect(Object.keys(actual as object).sort(), path).toEqual(Object.keys(expected).sort());
    for (const [k, v] of Object.entries(expected)) expectSame((actual as Record<string, unknown>)[k], v, `${path}.${k}`);
    return;
  }
  expect(actual, path).toEqual(expected);
}

function requestOf(block: string): { method: string; path: string; body?: string } {
  const [first, ...rest] = block.split("\n");
  const [method, path] = first!.split(" ") as [string, string];
  const blank = rest.indexOf("");
  return { method, path, body: blank >= 0 ? rest.slice(blank + 1).join("\n") : undefined };
}

const DOCS = [
  { name: "tests/integration/geo-api-examples.md", path: new URL("./geo-api-examples.md", import.meta.url) },
  { name: "README.md", path: new URL("../../README.md", import.meta.url) },
];

describe("documented examples", () => {
  for (const doc of DOCS) {
    const md = existsSync(doc.path) ? readFileSync(doc.path, "utf8") : "";
    const blocks = parseExamplesMarkdown(md);
    if (doc.name === "README.md" && blocks.length === 0) {
      it.skip("README.md has no geo-example blocks yet (pasted from the docs)", () => {});
      continue;
    }
    it(`${doc.name} documents every example`, () => {
      expect(blocks.map((b) => b.id).sort()).toEqual(EXAMPLES.map((e) => e.id).sort());
    });
    for (const b of blocks) {
      it(`${doc.name}: ${b.id}`, async () => {
        const ex = EXAMPLES.find((e) => e.id === b.id)!;
        const r = requestOf(b.request);
        // The documented request is the one in the example list …
        expect(r.path).toBe(ex.path);
        if (ex.method === "POST") expect(r.body).toBe(ex.rawBody ?? JSON.stringify(ex.body, null, 2));
        // … and replaying it gives the documented status and response.
        const res = await send(r.method, r.path, r.body, r.body ? { "Content-Type": "application/json" } : {});
        expect(res.status).toBe(b.status);
        expect(res.status).toBe(ex.status);
        expectSame(res.json, b.response);
      });
    }
  }
});

describe("GET /api/v1/convert", () => {
  it("the Ordnance Survey worked example to the millimetre, unrounded", async () => {
    // Ordnance Survey, "A guide to coordinate systems in Great Britain": 52°39′27.2531″N
    // 1°43′04.5177″E (OSGB36) ↔ E 651409.903 N 313177.270.
    const r = await send("GET", EXAMPLES.find((e) => e.id === "convert-osgb36-to-grid")!.path);
    expect(r.status).toBe(200);
    const { result } = r.json as { result: { easting: number; northing: number } };
    expect(Math.abs(result.easting - 651409.903)).toBeLessThan(0.001);
    expect(Math.abs(result.northing - 313177.27)).toBeLessThan(0.001);
    expect(String(result.easting)).not.toMatch(/^\d+\.\d{0,3}$/); // not rounded
    expect(r.headers.get("Cache-Control")).toBe("public, max-age=86400");
    expect(r.headers.get("Access-Control-Allow-Origin")).toBe("*");
    expect(r.headers.get("Content-Type")).toMatch(/application\/json/);
  });

  it("defaults from and to to WGS 84", async () => {
    const r = await send("GET", "/api/v1/convert?position=55.205%203.0183");
    expect(r.status).toBe(200);
    expect(r.json).toMatchObject({ from: "EPSG:4326", to: "EPSG:4326", result: { lat: 55.205, lon: 3.0183 }, formatted: { broadcast: "55-12.30N 003-01.10E" } });
  });

  it("errors are { error, field } with 400", async () => {
    const cases: [string, string, string | RegExp][] = [
      ["/api/v1/convert", "position", "Give position"],
      ["/api/v1/convert?position=", "position", "Enter a position"],
      ["/api/v1/convert?position=55N%203E&to=EPSG:9999", "to", /EPSG:9999 is not supported/],
      ["/api/v1/convert?position=55N%203E&from=EPSG:4230&fromTransformation=EPSG:1314", "fromTransformation", /not a transformation from ED50/],
      ["/api/v1/convert?position=55N%203E&to=EPSG:27700&toTransformation=nope", "toTransformation", /not a transformation from OSGB 1936/],
      ["/api/v1/convert?position=55%C2%B0N%203%C2%B0E&from=EPSG:27700", "position", /EPSG:27700 is projected/],
      ["/api/v1/convert?position=95N%203E", "position", "Latitude 95° is beyond 90°"],
    ];
    for (const [path, field, error] of cases) {
      const r = await send("GET", path);
      expect(r.status, path).toBe(400);
      expect((r.json as { field: string }).field, path).toBe(field);
      if (typeof error === "string") expect((r.json as { error: string }).error, path).toBe(error);
      else expect((r.json as { error: string }).error, path).toMatch(error);
      expect(Object.keys(r.json as object).sort()).toEqual(["error", "field"]);
      expect(r.headers.get("Cache-Control")).toBe("no-store");
    }
  });
});

describe("GET /api/v1/measure", () => {
  it("Geoscience Australia's Flinders Peak → Buninyong: 54 972.271 m, 306°52′05.37″, reverse 127°10′25.07″", async () => {
    const r = await send("GET", EXAMPLES.find((e) => e.id === "measure-ga")!.path);
    expect(r.status).toBe(200);
    const j = r.json as { distanceM: number; distanceNm: number; initialBearingTrueDeg: number; finalBearingTrueDeg: number };
    expect(Math.abs(j.distanceM - 54972.271)).toBeLessThan(0.001);
    expect(j.distanceNm).toBeCloseTo(54972.271 / 1852, 6); // 1 M = 1852 m exactly
    expect(Math.abs(j.initialBearingTrueDeg - (306 + 52 / 60 + 5.37 / 3600))).toBeLessThan(0.006 / 3600);
    expect(Math.abs(((j.finalBearingTrueDeg + 180) % 360) - (127 + 10 / 60 + 25.07 / 3600))).toBeLessThan(0.006 / 3600);
  });

  it("errors name from or to", async () => {
    expect((await send("GET", "/api/v1/measure?to=55N%203E")).json).toEqual({ error: "Give from", field: "from" });
    expect((await send("GET", "/api/v1/measure?from=55N%203E&to=55N")).json).toMatchObject({ field: "to" });
  });
});

describe("POST /api/v1/assessments", () => {
  it("answers the issue's body shape", async () => {
    const ks3 = EXAMPLES.find((e) => e.id === "assess-ks3")!;
    const r = await send("POST", ks3.path, JSON.stringify(ks3.body), { "Content-Type": "application/json" });
    expect(r.status).toBe(200);
    expect(r.json).toMatchObject({ verdict: "off_station", swingRadiusSource: "mooring" });
    expect(r.headers.get("Cache-Control")).toBe("no-store");
  });

  it("GET and other methods are 405 with Allow: POST", async () => {
    const g = await send("GET", "/api/v1/assessments");
    expect(g.status).toBe(405);
    expect(g.headers.get("Allow")).toBe("POST");
    expect(g.json).toMatchObject({ field: "" });
    const p = await send("PUT", "/api/v1/assessments", "{}");
    expect(p.status).toBe(405);
  });

  it("bodies that are not an assessment: 400 (413 when too large), never 500", async () => {
    const cases: [string | undefined, number, string | RegExp][] = [
      [undefined, 400, "Send a JSON body (Content-Type: application/json)"],
      ["", 400, "Send a JSON body (Content-Type: application/json)"],
      ["{", 400, /^The body is not valid JSON/],
      ["null", 400, /./],
      ["[]", 400, /./],
      ['"text"', 400, /./],
      ["42", 400, /./],
      ['{"charted":{}}', 400, /./],
      ["x".repeat(70_000), 413, "The body is larger than 64 kB"],
    ];
    for (const [body, status, error] of cases) {
      const r = await send("POST", "/api/v1/assessments", body, { "Content-Type": "application/json" });
      expect(r.status, String(body).slice(0, 20)).toBe(status);
      const j = r.json as { error: string; field: string };
      expect(typeof j.field).toBe("string");
      if (typeof error === "string") expect(j.error).toBe(error);
      else expect(j.error).toMatch(error);
    }
  });

  it("a form-encoded post is refused as not JSON", async () => {
    const r = await send("POST", "/api/v1/assessments", "charted=55N", { "Content-Type": "application/x-www-form-urlencoded" });
    expect(r.status).toBe(400);
    expect((r.json as { error: string }).error).toMatch(/not valid JSON/);
  });
});

describe("no input produces a 500", () => {
  it("arbitrary query strings", async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.dictionary(fc.constantFrom("from", "to", "position", "fromTransformation", "toTransformation", "x"), fc.string({ maxLength: 40 })),
        fc.constantFrom("/api/v1/convert", "/api/v1/measure"),
        async (params, route) => {
          const r = await send("GET", `${route}?${new URLSearchParams(params)}`);
          expect([200, 400]).toContain(r.status);
          if (r.status === 400) expect(typeof (r.json as { error: string }).error).toBe("string");
        },
      ),
      { numRuns: 300 },
    );
  });

  it("arbitrary JSON bodies", async () => {
    await fc.assert(
      fc.asyncProperty(fc.jsonValue({ maxDepth: 5 }), async (v) => {
        const r = await send("POST", "/api/v1/assessments", JSON.stringify(v), { "Content-Type": "application/json" });
        expect([200, 400]).toContain(r.status);
      }),
      { numRuns: 300 },
    );
  });

  it("near-miss assessment bodies", async () => {
    const ks3 = EXAMPLES.find((e) => e.id === "assess-ks3")!.body as Record<string, unknown>;
    const mutate = fc.record({
      key: fc.constantFrom("charted", "mooring", "observations", "swingRadiusM"),
      value: fc.oneof(fc.jsonValue({ maxDepth: 3 }), fc.constant(undefined)),
    });
    await fc.assert(
      fc.asyncProperty(mutate, async ({ key, value }) => {
        const r = await send("POST", "/api/v1/assessments", JSON.stringify({ ...ks3, [key]: value }), { "Content-Type": "application/json" });
        expect([200, 400]).toContain(r.status);
      }),
      { numRuns: 300 },
    );
  });
});
