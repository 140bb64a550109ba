import { describe, expect, it } from "vitest";
import {
  cablesToMetres,
  direct,
  fromLocalEN,
  geodesicOn,
  inverse,
  METRES_PER_CABLE,
  METRES_PER_NAUTICAL_MILE,
  metresToCables,
  metresToNauticalMiles,
  nauticalMilesToMetres,
  normaliseBearing,
  reverseBearing,
  toLocalEN,
} from "~/lib/geo/geodesy";

const dms = (d: number, m: number, s: number) => Math.sign(d || 1) * (Math.abs(d) + m / 60 + s / 3600);
const ARCSEC = 1 / 3600;

// Geoscience Australia's Vincenty worked example (GDA technical manual): Flinders Peak
// −37°57′03.72030″ 144°25′29.52440″ to Buninyong −37°39′10.15610″ 143°55′35.38390″:
// 54 972.271 m, forward azimuth 306°52′05.37″, reverse azimuth 127°10′25.07″. The example is
// on GRS 80; GRS 80 and WGS 84 differ in flattening by ~1e-11, far below these tolerances.
const FLINDERS = { lat: -dms(37, 57, 3.7203), lon: dms(144, 25, 29.5244) };
const BUNINYONG = { lat: -dms(37, 39, 10.1561), lon: dms(143, 55, 35.3839) };
const GA_DISTANCE = 54972.271;
const GA_FORWARD = dms(306, 52, 5.37);
const GA_REVERSE = dms(127, 10, 25.07);

describe("Geoscience Australia: Flinders Peak → Buninyong", () => {
  it("as an inverse problem", () => {
    const r = inverse(FLINDERS.lat, FLINDERS.lon, BUNINYONG.lat, BUNINYONG.lon);
    expect(Math.abs(r.distanceM - GA_DISTANCE)).toBeLessThan(0.001);
    expect(Math.abs(r.initialBearingTrueDeg - GA_FORWARD)).toBeLessThan(0.006 * ARCSEC);
    expect(Math.abs(reverseBearing(r.finalBearingTrueDeg) - GA_REVERSE)).toBeLessThan(0.006 * ARCSEC);
    expect(r.distanceNm).toBeCloseTo(GA_DISTANCE / 1852, 6);
  });

  it("as a direct problem", () => {
    const r = direct(FLINDERS.lat, FLINDERS.lon, GA_FORWARD, GA_DISTANCE);
    // The azimuth is published to 0.01″ (≈ 1.3 mm of arc at 55 km): allow 3 mm.
    const back = inverse(r.lat, r.lon, BUNINYONG.lat, BUNINYONG.lon);
    expect(back.distanceM).toBeLessThan(0.003);
    expect(Math.abs(reverseBearing(r.finalBearingTrueDeg) - GA_REVERSE)).toBeLessThan(0.006 * ARCSEC);
  });

  it("on the GRS 80 ellipsoid of the original example", () => {
    const grs80 = geodesicOn(6378137, 1 / 298.257222101);
    const r = grs80.Inverse(FLINDERS.lat, FLINDERS.lon, BUNINYONG.lat, BUNINYONG.lon);
    expect(Math.abs(r.s12! - GA_DISTANCE)).toBeLessThan(0.001);
  });
});

describe("Karney (2013), Algorithms for geodesics, J. Geodesy 87:43–55", () => {
  it("Table 2 direct example: φ1 40°, α1 30°, s12 10 000 km", () => {
    // Published: φ2 41.79331020506°, λ2 137.84490004377°, α2 149.09016931807°.
    const r = direct(40, 0, 30, 10_000_000);
    expect(Math.abs(r.lat - 41.79331020506)).toBeLessThan(1e-11);
    expect(Math.abs(r.lon - 137.84490004377)).toBeLessThan(1e-11);
    expect(Math.abs(r.finalBearingTrueDeg - 149.09016931807)).toBeLessThan(1e-11);
  });

  it("Table 3 inverse example (a short line where Vincenty is compared)", () => {
    // Published: φ1 −30.12345°, φ2 −30.12344°, λ12 0.00005° → α1 77.043533°, α2 77.043508°,
    // s12 4.944208 m (printed to 6 decimals: we compute 77.0435335°, so allow one unit of the
    // last printed digit).
    const r = inverse(-30.12345, 0, -30.12344, 0.00005);
    expect(Math.abs(r.initialBearingTrueDeg - 77.043533)).toBeLessThan(1e-6);
    expect(Math.abs(r.finalBearingTrueDeg - 77.043508)).toBeLessThan(1e-6);
    expect(Math.abs(r.distanceM - 4.944208)).toBeLessThan(5e-7);
  });
});

describe("units", () => {
  it("1 nautical mile is 1852 m exactly (International Hydrographic Conference, Monaco, 1929)", () => {
    expect(METRES_PER_NAUTICAL_MILE).toBe(1852);
    expect(nauticalMilesToMetres(1)).toBe(1852);
    expect(metresToNauticalMiles(1852)).toBe(1);
    expect(nauticalMilesToMetres(0.42)).toBeCloseTo(777.84, 10);
  });

  it("1 cable is 0.1 M = 185.2 m (common practice)", () => {
    expect(METRES_PER_CABLE).toBe(185.2);
    expect(cablesToMetres(10)).toBe(1852);
    expect(metresToCables(370.4)).toBe(2);
    const r = inverse(55, 3, 55.01, 3);
    expect(r.distanceCables).toBeCloseTo(r.distanceM / 185.2, 12);
  });

  it("a minute of latitude is not exactly a nautical mile (TRADE.md: 1842.9 m at the equator, 1861.6 m at the pole)", () => {
    expect(inverse(0, 0, 1 / 60, 0).distanceM).toBeCloseTo(1842.9, 0);
    expect(inverse(90 - 1 / 60, 0, 90, 0).distanceM).toBeCloseTo(1861.6, 0);
  });
});

describe("bearings are degrees true in [0, 360)", () => {
  it("normalises", () => {
    expect(normaliseBearing(-90)).toBe(270);
    expect(normaliseBearing(360)).toBe(0);
    expect(normaliseBearing(720.5)).toBeCloseTo(0.5, 12);
    expect(normaliseBearing(-0)).toBe(0);
    expect(Object.is(normaliseBearing(-1e-17), 0)).toBe(true);
    expect(normaliseBearing(-1e-13)).toBeLessThan(360);
  });

  it("cardinal directions from a point", () => {
    expect(inverse(55, 3, 55.1, 3).initialBearingTrueDeg).toBeCloseTo(0, 9);
    expect(inverse(55, 3, 55, 3.1).initialBearingTrueDeg).toBeGreaterThan(89.9);
    expect(inverse(55, 3, 54.9, 3).initialBearingTrueDeg).toBeCloseTo(180, 9);
    expect(inverse(55, 3, 55, 2.9).initialBearingTrueDeg).toBeGreaterThan(269.9);
  });
});

describe("local east/north plane", () => {
  it("round-trips and keeps distance and bearing exact from the origin", () => {
    const o = { lat: 55.205, lon: 3.0183 };
    const p = direct(o.lat, o.lon, 47, 777.84);
    const en = toLocalEN(o.lat, o.lon, p.lat, p.lon);
    expect(Math.hypot(en.e, en.n)).toBeCloseTo(777.84, 6);
    expect((Math.atan2(en.e, en.n) * 180) / Math.PI).toBeCloseTo(47, 9);
    const back = fromLocalEN(o.lat, o.lon, en.e, en.n);
    expect(inverse(back.lat, back.lon, p.lat, p.lon).distanceM).toBeLessThan(1e-6);
    expect(fromLocalEN(o.lat, o.lon, 0, 0)).toEqual(o);
  });
});
