import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { safeAssess } from "~/lib/geo/assessment";
import { convert, type Coord, type GeographicCoord, type ProjectedCoord } from "~/lib/geo/crs";
import { direct, inverse } from "~/lib/geo/geodesy";
import { formatPosition, parsePosition, parsePositionGeneral, type PositionStyle } from "~/lib/geo/positions";

const lat = fc.double({ min: -90, max: 90, noNaN: true, noDefaultInfinity: true });
const lon = fc.double({ min: -180, max: 180, noNaN: true, noDefaultInfinity: true });

/** Smallest unit of each style at `d` decimals, in degrees. */
function unitDeg(style: PositionStyle, d: number): number {
  const perDegree = style === "dd" ? 1 : style === "dms" ? 3600 : 60;
  return 1 / (perDegree * 10 ** d);
}

describe("format ∘ parse round trips", () => {
  const styles: [PositionStyle, number][] = [
    ["dd", 0],
    ["dd", 5],
    ["dd", 8],
    ["ddm", 0],
    ["ddm", 2],
    ["ddm", 3],
    ["ddm", 6],
    ["dms", 0],
    ["dms", 1],
    ["dms", 4],
    ["broadcast", 0],
    ["broadcast", 1],
    ["broadcast", 2],
  ];
  for (const [style, decimals] of styles) {
    for (const marks of ["unicode", "ascii"] as const) {
      it(`${style} with ${decimals} decimals (${marks})`, () => {
        fc.assert(
          fc.property(lat, lon, fc.boolean(), (la, lo, signed) => {
            const text = formatPosition(la, lo, style, { decimals, marks, signed: style === "dd" && signed });
            const r = parsePosition(text);
            if (!r.ok) throw new Error(`${text}: ${r.error}`);
            const half = unitDeg(style, decimals) / 2 + 1e-9;
            expect(Math.abs(r.lat - la)).toBeLessThanOrEqual(half);
            // Longitude ±180 are the same meridian.
            const dLon = Math.abs(r.lon - lo);
            expect(Math.min(dLon, 360 - dLon)).toBeLessThanOrEqual(half);
            // Formatting what was parsed gives the same text back.
            expect(formatPosition(r.lat, r.lon, style, { decimals, marks, signed: style === "dd" && signed })).toBe(text);
          }),
          { numRuns: 300 },
        );
      });
    }
  }

  it("the regex fast path and the general parser agree", () => {
    fc.assert(
      fc.property(lat, lon, fc.constantFrom<PositionStyle>("ddm", "broadcast", "dd"), fc.integer({ min: 0, max: 4 }), (la, lo, style, d) => {
        const text = formatPosition(la, lo, style, { decimals: style === "broadcast" ? Math.min(d, 2) : d, signed: style === "dd" });
        expect(parsePosition(text)).toEqual(parsePositionGeneral(text));
      }),
      { numRuns: 500 },
    );
  });

  it("arbitrary text never throws: it parses or gives a message", () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 60 }), (s) => {
        const r = parsePosition(s);
        if (r.ok) {
          expect(Math.abs(r.lat)).toBeLessThanOrEqual(90);
          expect(Math.abs(r.lon)).toBeLessThanOrEqual(180);
        } else expect(r.error.length).toBeGreaterThan(0);
      }),
      { numRuns: 2000 },
    );
    const alphabet = fc.constantFrom(..."0123456789.,-+ °′″'\"NSEWnsew".split(""));
    fc.assert(
      fc.property(fc.array(alphabet, { maxLength: 40 }).map((a) => a.join("")), (s) => {
        const r = parsePosition(s);
        expect(r.ok || r.error.length > 0).toBe(true);
        // The fast path may only ever agree with the general parser.
        expect(parsePosition(s)).toEqual(parsePositionGeneral(s));
      }),
      { numRuns: 3000 },
    );
  });
});

/** Distance in metres between two coordinates of the same kind. */
function gap(a: Coord, b: Coord): number {
  if ("lat" in a) {
    const g = b as GeographicCoord;
    return inverse(a.lat, a.lon, g.lat, g.lon).distanceM;
  }
  const p = b as ProjectedCoord;
  return Math.hypot(a.easting - p.easting, a.northing - p.northing);
}

describe("A → B → A within a millimetre", () => {
  // Pairs over their areas of use (round trips far outside a projection's zone are not meaningful).
  const cases: { from: string; to: string; lat: [number, number]; lon: [number, number] }[] = [
    { from: "EPSG:4326", to: "EPSG:4277", lat: [49.8, 60.9], lon: [-8, 1.8] },
    { from: "EPSG:4326", to: "EPSG:27700", lat: [49.8, 60.9], lon: [-8, 1.8] },
    { from: "EPSG:4230", to: "EPSG:4326", lat: [35, 71], lon: [-10, 30] },
    { from: "EPSG:4230", to: "EPSG:23031", lat: [50, 62], lon: [0, 6] },
    { from: "EPSG:4326", to: "EPSG:32631", lat: [0, 84], lon: [0, 6] },
    { from: "EPSG:4326", to: "EPSG:32756", lat: [-80, 0], lon: [150, 156] },
    { from: "EPSG:4267", to: "EPSG:26718", lat: [25, 50], lon: [-78, -72] },
    { from: "EPSG:4269", to: "EPSG:26918", lat: [25, 50], lon: [-78, -72] },
    { from: "EPSG:4258", to: "EPSG:25831", lat: [35, 71], lon: [0, 6] },
    { from: "EPSG:4326", to: "EPSG:2157", lat: [51.4, 55.4], lon: [-10.6, -5.3] },
    { from: "EPSG:4322", to: "EPSG:4230", lat: [35, 71], lon: [-10, 30] },
  ];
  for (const c of cases) {
    it(`${c.from} → ${c.to} → ${c.from}`, () => {
      fc.assert(
        fc.property(fc.double({ min: c.lat[0], max: c.lat[1], noNaN: true }), fc.double({ min: c.lon[0], max: c.lon[1], noNaN: true }), (la, lo) => {
          const a: Coord = { lat: la, lon: lo };
          const b = convert(c.from, c.to, a);
          const back = convert(c.to, c.from, b);
          expect(gap(a, back)).toBeLessThan(0.001);
        }),
        { numRuns: 200 },
      );
    });
  }
});

describe("direct ∘ inverse consistency on WGS 84", () => {
  it("travelling the inverse solution's bearing and distance arrives at the end point", () => {
    fc.assert(
      fc.property(lat, lon, lat, lon, (la1, lo1, la2, lo2) => {
        const inv = inverse(la1, lo1, la2, lo2);
        const d = direct(la1, lo1, inv.initialBearingTrueDeg, inv.distanceM);
        expect(inverse(d.lat, d.lon, la2, lo2).distanceM).toBeLessThan(0.001);
        expect(inv.initialBearingTrueDeg).toBeGreaterThanOrEqual(0);
        expect(inv.initialBearingTrueDeg).toBeLessThan(360);
      }),
      { numRuns: 500 },
    );
  });

  it("the inverse of a direct step returns its distance and bearing", () => {
    fc.assert(
      fc.property(fc.double({ min: -85, max: 85, noNaN: true }), lon, fc.double({ min: 0, max: 359.999, noNaN: true }), fc.double({ min: 1, max: 50_000, noNaN: true }), (la, lo, brg, s) => {
        const d = direct(la, lo, brg, s);
        const inv = inverse(la, lo, d.lat, d.lon);
        expect(Math.abs(inv.distanceM - s)).toBeLessThan(0.001);
        const db = Math.abs(inv.initialBearingTrueDeg - brg);
        expect(Math.min(db, 360 - db)).toBeLessThan(1e-6);
      }),
      { numRuns: 500 },
    );
  });
});

describe("assessment never throws on arbitrary JSON", () => {
  it("gives a result or { error, field }", () => {
    fc.assert(
      fc.property(fc.jsonValue({ maxDepth: 4 }), (v) => {
        const r = safeAssess(v);
        if (!r.ok) expect(typeof r.field).toBe("string");
      }),
      { numRuns: 500 },
    );
  });
});
