import geomagnetism from "geomagnetism";
import { describe, expect, it } from "vitest";
import { GeoInputError } from "~/lib/geo/errors";
import { MAGNETIC_MODEL_END, magneticDeclination, magneticToTrue, PACKAGE_WMM2025_END } from "~/lib/geo/magnetic";

/** Decimal year → Date, with 365-day years as the geomagnetism package computes them. */
function dateOf(decimalYear: number): Date {
  const y = Math.floor(decimalYear);
  return new Date(Date.UTC(y, 0, 1) + (decimalYear - y) * 365 * 24 * 3600 * 1000);
}

describe("World Magnetic Model 2025 test values", () => {
  // NOAA NCEI, WMM2025 test values published with the model (12 points: 2025.0 and 2027.5, 0 and
  // 100 km above the WGS 84 ellipsoid); columns: decimal year, height km, lat, lon, D (deg).
  const NOAA_12 = [
    [2025.0, 0, 80, 0, 1.28],
    [2025.0, 0, 0, 120, -0.16],
    [2025.0, 0, -80, -120, 68.78],
    [2025.0, 100, 80, 0, 0.85],
    [2025.0, 100, 0, 120, -0.15],
    [2025.0, 100, -80, -120, 68.21],
    [2027.5, 0, 80, 0, 2.59],
    [2027.5, 0, 0, 120, -0.24],
    [2027.5, 0, -80, -120, 68.49],
    [2027.5, 100, 80, 0, 2.16],
    [2027.5, 100, 0, 120, -0.23],
    [2027.5, 100, -80, -120, 67.93],
  ] as const;
  it.each(NOAA_12)("%d, %d km, %d°, %d° → D %d°", (year, hKm, lat, lon, decl) => {
    const d = magneticDeclination(lat, lon, dateOf(year), hKm);
    expect(d.model).toBe("WMM2025");
    expect(Math.abs(d.declinationDeg - decl)).toBeLessThanOrEqual(0.0051);
  });

  // Rows of NOAA's WMM2025_TEST_VALUES.txt (100 vectors over 2025.0–2029.5) as shipped in
  // geomagnetism 0.2.0's test/values.csv: year, height km, lat, lon, D (deg).
  const NOAA_100 = [
    [2025.0, 28, 89, -121, -99.77],
    [2025.0, 39, -59, -8, -15.75],
    [2025.5, 6, -36, -137, 20.28],
    [2026.0, 62, -14, 99, -1.43],
    [2026.5, 12, 33, -145, 11.96],
    [2027.0, 44, -43, -111, 24.31],
    [2027.5, 8, 62, 53, 19.39],
    [2028.0, 49, 20, 167, 5.1],
    [2028.5, 28, 54, -120, 15.43],
    [2029.0, 95, -60, -59, 8.58],
    [2029.5, 31, 13, -132, 9.04],
    [2029.5, 66, -21, 32, -14.63],
  ] as const;
  it.each(NOAA_100)("%d, %d km, %d°, %d° → D %d°", (year, hKm, lat, lon, decl) => {
    expect(Math.abs(magneticDeclination(lat, lon, dateOf(year), hKm).declinationDeg - decl)).toBeLessThanOrEqual(0.0051);
  });
});

describe("geomagnetism traps (STACK.md)", () => {
  it("the package refuses dates after 2029-11-13; Tidewire covers WMM2025 up to 2030.0", () => {
    const late = new Date("2029-12-20T12:00:00Z");
    expect(() => geomagnetism.model(late)).toThrow(/only valid/);
    const ours = magneticDeclination(55.2, 3.03, late);
    expect(ours.model).toBe("WMM2025");
    // The package's own answer just before its cut-off: secular variation over five weeks is
    // a few hundredths of a degree at most.
    const before = geomagnetism.model(new Date(PACKAGE_WMM2025_END.getTime() - 86_400_000)).point([55.2, 3.03, 0]).decl;
    expect(Math.abs(ours.declinationDeg - before)).toBeLessThan(0.05);
    expect(magneticDeclination(55.2, 3.03, new Date("2029-12-31T23:59:59Z")).model).toBe("WMM2025");
  });

  it("dates from 2030-01-01 are refused with a clear message", () => {
    expect(() => magneticDeclination(55.2, 3.03, MAGNETIC_MODEL_END)).toThrow(
      "2030-01-01 is after the World Magnetic Model 2025 validity (to 2030-01-01): magnetic variation cannot be computed",
    );
    expect(() => magneticDeclination(55.2, 3.03, new Date("2019-06-01T00:00:00Z"))).toThrow(
      "2019-06-01 is before 2020-01-01, the earliest date Tidewire's magnetic models cover",
    );
    try {
      magneticDeclination(55.2, 3.03, new Date("2031-01-01T00:00:00Z"), 0, "observations.2.observedAt");
    } catch (e) {
      expect(e).toBeInstanceOf(GeoInputError);
      expect((e as GeoInputError).field).toBe("observations.2.observedAt");
    }
    expect(() => magneticDeclination(55.2, 3.03, new Date("nonsense"))).toThrow("Give the date and time of the observation");
  });

  it("heights are kilometres above the ellipsoid: 100 km gives the published value, 100 000 does not", () => {
    // NOAA WMM2025 test value: 2025.0, 100 km, 80°N 0°E → D 0.85°.
    expect(magneticDeclination(80, 0, dateOf(2025), 100).declinationDeg).toBeCloseTo(0.85, 2);
    expect(Math.abs(magneticDeclination(80, 0, dateOf(2025), 100_000).declinationDeg - 0.85)).toBeGreaterThan(0.1);
  });

  it("declination is east-positive: true = magnetic + declination", () => {
    // NOAA WMM2025 test value: 2025.0, 0 km, 80°S 120°W → D 68.78° (east).
    const d = magneticDeclination(-80, -120, dateOf(2025)).declinationDeg;
    expect(magneticToTrue(0, d)).toBeCloseTo(68.78, 2);
    // West declination (−99.77° at 89°N 121°W, 28 km) turns 95° magnetic into 355.23° true.
    const west = magneticDeclination(89, -121, dateOf(2025), 28).declinationDeg;
    expect(magneticToTrue(95, west)).toBeCloseTo(355.23, 2);
    expect(magneticToTrue(359, 2)).toBeCloseTo(1, 12);
  });

  it("older reports (2020.0–2025.0) use WMM2020 and match the package", () => {
    const at = new Date("2024-06-01T00:00:00Z");
    const ours = magneticDeclination(55.2, 3.03, at);
    expect(ours.model).toBe("WMM2020");
    expect(ours.declinationDeg).toBeCloseTo(geomagnetism.model(at).point([55.2, 3.03, 0]).decl, 10);
  });

  it("Kestrel Sound declination in late 2026 is small and easterly", () => {
    const d = magneticDeclination(55.2, 3.03, new Date("2026-11-20T14:05:00Z"));
    expect(d.declinationDeg).toBeGreaterThan(0);
    expect(d.declinationDeg).toBeLessThan(5);
  });
});
