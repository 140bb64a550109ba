import { describe, expect, it } from "vitest";
import { direct, inverse } from "~/lib/geo/geodesy";
import { magneticDeclination } from "~/lib/geo/magnetic";
import {
  DECLINATION_ERROR_95_DEG,
  ESTIMATED_DISTANCE_FRACTION_95,
  GNSS_ALONGSIDE_OFFSET_95_M,
  GNSS_HORIZONTAL_95_M,
  HAND_COMPASS_ERROR_95_DEG,
  observationToPosition,
  RADAR_BEARING_ERROR_DEG,
  RADAR_RANGE_ERROR_MIN_M,
  RADAR_RANGE_ERROR_SCALE_FRACTION,
  radarRangeError95M,
} from "~/lib/geo/observation";
import { K95_2D, principalSigmas, radius95, Z95_1D } from "~/lib/geo/uncertainty";

const OWN = { ownLat: 55.2, ownLon: 3.0083 };

describe("IMO radar accuracy (performance standards for radar equipment, MSC.192(79))", () => {
  it("range error is the larger of 30 m or 1% of the range scale in use", () => {
    expect(RADAR_RANGE_ERROR_MIN_M).toBe(30);
    expect(RADAR_RANGE_ERROR_SCALE_FRACTION).toBe(0.01);
    expect(radarRangeError95M(0.75)).toBe(30); // 1% of 0.75 M = 13.9 m < 30 m
    expect(radarRangeError95M(1.5)).toBe(30); // 27.8 m < 30 m
    expect(radarRangeError95M(3)).toBeCloseTo(55.56, 10); // 1% of 3 M
    expect(radarRangeError95M(12)).toBeCloseTo(222.24, 10);
    expect(radarRangeError95M(30 / 18.52)).toBeCloseTo(30, 10); // the crossover, 1.62 M
  });

  it("bearing error is 1°", () => {
    expect(RADAR_BEARING_ERROR_DEG).toBe(1);
  });

  it("places the target along the true bearing at the measured range, with the figures behind it", () => {
    const o = observationToPosition({ method: "radar", ...OWN, rangeNm: 0.42, bearingDeg: 47, bearingRef: "true", rangeScaleNm: 0.75 });
    const back = inverse(OWN.ownLat, OWN.ownLon, o.lat, o.lon);
    expect(back.distanceM).toBeCloseTo(0.42 * 1852, 6);
    expect(back.initialBearingTrueDeg).toBeCloseTo(47, 9);
    expect(o.figures).toMatchObject({ rangeError95M: 30, bearingError95Deg: 1, ownPositionError95M: GNSS_HORIZONTAL_95_M, rangeScaleNm: 0.75 });
    expect(o.figures.crossRangeError95M).toBeCloseTo(777.84 * Math.tan(Math.PI / 180), 9);
    // Principal axes: along-range combines 30 m (1-D 95%) with the own GNSS error.
    const own = GNSS_HORIZONTAL_95_M / K95_2D;
    const [s1, s2] = principalSigmas(o.covariance);
    expect(s1).toBeCloseTo(Math.sqrt((30 / Z95_1D) ** 2 + own ** 2), 9);
    expect(s2).toBeCloseTo(Math.sqrt(((o.figures.crossRangeError95M as number) / Z95_1D) ** 2 + own ** 2), 9);
    expect(o.uncertaintyM).toBeCloseTo(radius95(o.covariance), 12);
    expect(o.uncertaintyM).toBeGreaterThan(30);
    expect(o.uncertaintyM).toBeLessThan(40);
  });

  it("a relative bearing plus heading gives the same position, with the heading error added", () => {
    const t = observationToPosition({ method: "radar", ...OWN, rangeNm: 0.42, bearingDeg: 47, bearingRef: "true", rangeScaleNm: 0.75 });
    const r = observationToPosition({ method: "radar", ...OWN, rangeNm: 0.42, bearingDeg: 350, bearingRef: "relative", headingTrueDeg: 57, rangeScaleNm: 0.75 });
    expect(inverse(t.lat, t.lon, r.lat, r.lon).distanceM).toBeLessThan(1e-6);
    expect(r.figures.bearingTrueDeg).toBeCloseTo(47, 12);
    expect(r.figures.bearingError95Deg).toBeCloseTo(Math.SQRT2, 12);
    expect(r.uncertaintyM).toBeGreaterThan(t.uncertaintyM);
  });
});

describe("GNSS alongside", () => {
  it("combines the fix (GPS SPS PS 2020, 9 m 95%, from memory) with the alongside offset (10 m, our assumption)", () => {
    const o = observationToPosition({ method: "gnss", lat: 55.2, lon: 3.03 });
    expect(o).toMatchObject({ lat: 55.2, lon: 3.03, figures: { gnssError95M: 9, alongsideOffset95M: 10 } });
    // Both circular: the 95% radii add in quadrature exactly.
    expect(o.uncertaintyM).toBeCloseTo(Math.hypot(GNSS_HORIZONTAL_95_M, GNSS_ALONGSIDE_OFFSET_95_M), 3);
    expect(observationToPosition({ method: "gnss", lat: 55.2, lon: 3.03, accuracyM: 3, offsetM: 4 }).uncertaintyM).toBeCloseTo(5, 3);
  });
});

describe("hand-bearing compass", () => {
  it("converts magnetic to true with WMM2025 and reports the declination", () => {
    const at = new Date("2026-11-20T14:20:00Z");
    const o = observationToPosition({ method: "compass", ...OWN, bearingMagneticDeg: 95, distanceM: 300, observedAt: at });
    const d = magneticDeclination(OWN.ownLat, OWN.ownLon, at).declinationDeg;
    expect(o.declinationDeg).toBe(d);
    expect(o.figures.bearingTrueDeg).toBeCloseTo(95 + d, 12);
    const expected = direct(OWN.ownLat, OWN.ownLon, 95 + d, 300);
    expect(inverse(o.lat, o.lon, expected.lat, expected.lon).distanceM).toBeLessThan(1e-6);
    expect(o.figures).toMatchObject({
      magneticModel: "WMM2025",
      distanceError95M: 300 * ESTIMATED_DISTANCE_FRACTION_95,
      bearingError95Deg: Math.hypot(HAND_COMPASS_ERROR_95_DEG, DECLINATION_ERROR_95_DEG),
    });
    expect(HAND_COMPASS_ERROR_95_DEG).toBe(2); // common practice (TRADE.md)
  });

  it("a measured distance uncertainty replaces the 25% default", () => {
    const at = new Date("2026-11-20T14:20:00Z");
    const a = observationToPosition({ method: "compass", ...OWN, bearingMagneticDeg: 95, distanceM: 300, observedAt: at });
    const b = observationToPosition({ method: "compass", ...OWN, bearingMagneticDeg: 95, distanceM: 300, distanceUncertaintyM: 10, observedAt: at });
    expect(b.uncertaintyM).toBeLessThan(a.uncertaintyM);
  });
});
