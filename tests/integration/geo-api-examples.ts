// The documented examples of the position API (GET /api/v1/convert, GET /api/v1/measure,
// POST /api/v1/assessments). tests/integration/geo-api.test.ts runs every one against the
// route modules and compares the whole response with the documented one; the README's API
// section is generated from this list (see renderExamplesMarkdown) and checked too.

export interface ApiExample {
  id: string;
  title: string;
  method: "GET" | "POST";
  /** Path with query, as a client would send it (query values percent-encoded). */
  path: string;
  body?: unknown;
  /** Raw body text, for examples of malformed bodies. */
  rawBody?: string;
  status: number;
  /** Filled in from the live response when the docs are generated; the test compares to it. */
  response?: unknown;
}

const q = (params: Record<string, string>) => new URLSearchParams(params).toString();

export const KS3_BODY = {
  charted: { position: "55°11.700′N 003°00.600′E", crs: "EPSG:4326" },
  mooring: { chainLengthM: 30, depthM: 10 },
  observations: [
    {
      method: "radar",
      ownPosition: "55°11.557′N 003°00.340′E",
      rangeNm: 0.27,
      bearingDeg: 58,
      bearingRef: "true",
      rangeScaleNm: 0.75,
      observedAt: "2026-11-20T07:40:00Z",
    },
    { method: "gnss", position: "55°11.702′N 003°00.738′E", observedAt: "2026-11-20T09:15:00Z" },
  ],
};

export const COMPASS_BODY = {
  charted: { position: "55°12.30′N 003°01.10′E", crs: "EPSG:4230", transformation: "EPSG:1311" },
  swingRadiusM: 25,
  observations: [
    { method: "compass", ownPosition: "55°12.161′N 003°00.764′E", bearingMagneticDeg: 54, distanceM: 320, observedAt: "2026-11-20T14:20:00Z" },
  ],
};

export const EXAMPLES: ApiExample[] = [
  {
    id: "convert-osgb36-to-grid",
    title: "OSGB36 latitude/longitude to British National Grid (the Ordnance Survey worked example)",
    method: "GET",
    path: `/api/v1/convert?${q({ from: "EPSG:4277", to: "EPSG:27700", position: "52°39′27.2531″N 1°43′04.5177″E" })}`,
    status: 200,
  },
  {
    id: "convert-grid-to-wgs84",
    title: "A projected source is \"easting northing\"",
    method: "GET",
    path: `/api/v1/convert?${q({ from: "EPSG:27700", to: "EPSG:4326", position: "651409.903 313177.270" })}`,
    status: 200,
  },
  {
    id: "convert-ed50-default",
    title: "An ED50 chart position to WGS 84 with the default transformation (EPSG:1133)",
    method: "GET",
    path: `/api/v1/convert?${q({ from: "EPSG:4230", to: "EPSG:4326", position: "55-12.30N 003-01.10E" })}`,
    status: 200,
  },
  {
    id: "convert-ed50-north-sea",
    title: "The same with the North Sea transformation chosen (EPSG:1311)",
    method: "GET",
    path: `/api/v1/convert?${q({ from: "EPSG:4230", to: "EPSG:4326", position: "55-12.30N 003-01.10E", fromTransformation: "EPSG:1311" })}`,
    status: 200,
  },
  {
    id: "convert-utm",
    title: "WGS 84 to UTM zone 31N",
    method: "GET",
    path: `/api/v1/convert?${q({ from: "EPSG:4326", to: "EPSG:32631", position: "55.205 3.0183" })}`,
    status: 200,
  },
  {
    id: "convert-error-minutes",
    title: "An impossible position names the field",
    method: "GET",
    path: `/api/v1/convert?${q({ from: "EPSG:4326", to: "EPSG:4230", position: "55°61.0′N 003°01.1′E" })}`,
    status: 400,
  },
  {
    id: "convert-error-crs",
    title: "An unsupported CRS",
    method: "GET",
    path: `/api/v1/convert?${q({ from: "EPSG:3857", to: "EPSG:4326", position: "55N 3E" })}`,
    status: 400,
  },
  {
    id: "measure-ga",
    title: "Distance and bearings (Geoscience Australia's Flinders Peak → Buninyong example)",
    method: "GET",
    path: `/api/v1/measure?${q({ from: "37°57′03.72030″S 144°25′29.52440″E", to: "37°39′10.15610″S 143°55′35.38390″E" })}`,
    status: 200,
  },
  {
    id: "measure-error",
    title: "A missing value",
    method: "GET",
    path: `/api/v1/measure?${q({ from: "55°12.30′N 003°01.10′E" })}`,
    status: 400,
  },
  {
    id: "assess-ks3",
    title: "Channel buoy KS3 after the gale: radar from a fishing boat, then the ferry alongside",
    method: "POST",
    path: "/api/v1/assessments",
    body: KS3_BODY,
    status: 200,
  },
  {
    id: "assess-compass",
    title: "A hand-bearing compass fix on an ED50 chart position (magnetic converted to true with WMM2025): too rough to settle it",
    method: "POST",
    path: "/api/v1/assessments",
    body: COMPASS_BODY,
    status: 200,
  },
  {
    id: "assess-error-range",
    title: "A radar range beyond the range scale in use",
    method: "POST",
    path: "/api/v1/assessments",
    body: { ...KS3_BODY, observations: [{ ...KS3_BODY.observations[0], rangeNm: 0.9 }] },
    status: 400,
  },
  {
    id: "assess-error-json",
    title: "A body that is not JSON",
    method: "POST",
    path: "/api/v1/assessments",
    rawBody: "charted=55N",
    status: 400,
  },
];

/** The markdown of every example, between markers the test can find again. */
export function renderExamplesMarkdown(examples: ApiExample[]): string {
  return examples
    .map((e) => {
      const req =
        e.method === "GET"
          ? "```http\nGET " + e.path + "\n```"
          : "```http\nPOST " + e.path + "\nContent-Type: application/json\n\n" + (e.rawBody ?? JSON.stringify(e.body, null, 2)) + "\n```";
      return [
        `<!-- geo-example: ${e.id} -->`,
        `**${e.title}**`,
        "",
        req,
        "",
        `Response \`${e.status}\`:`,
        "",
        "```json\n" + JSON.stringify(e.response, null, 2) + "\n```",
        `<!-- /geo-example -->`,
      ].join("\n");
    })
    .join("\n\n");
}

/** Read the examples back out of a markdown document (README or the docs page). */
export function parseExamplesMarkdown(md: string): { id: string; request: string; status: number; response: unknown }[] {
  const out: { id: string; request: string; status: number; response: unknown }[] = [];
  const re = /<!-- geo-example: ([\w-]+) -->([\s\S]*?)<!-- \/geo-example -->/g;
  for (const m of md.matchAll(re)) {
    const block = m[2]!;
    const req = /```http\n([\s\S]*?)\n```/.exec(block)?.[1] ?? "";
    const status = Number(/Response `(\d+)`/.exec(block)?.[1]);
    const json = /```json\n([\s\S]*?)\n```/.exec(block)?.[1] ?? "null";
    out.push({ id: m[1]!, request: req, status, response: JSON.parse(json) });
  }
  return out;
}
