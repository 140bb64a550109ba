import { describe, expect, it } from "vitest";
import { assess, CAUTION, safeAssess, VERDICT_RULE } from "~/lib/geo/assessment";
import { fromWgs84 } from "~/lib/geo/crs";
import { GeoInputError } from "~/lib/geo/errors";
import { direct, inverse } from "~/lib/geo/geodesy";
import { GNSS_ALONGSIDE_OFFSET_95_M, GNSS_HORIZONTAL_95_M } from "~/lib/geo/observation";
import { formatPosition } from "~/lib/geo/positions";
import { assessmentInputSchema, fieldErrors } from "~/lib/geo/schemas";

// An invented channel buoy in Kestrel Sound (DEMO.md), charted on WGS 84.
const C = { lat: 55.195, lon: 3.01 };
const text = (p: { lat: number; lon: number }) => formatPosition(p.lat, p.lon, "dd", { decimals: 8, signed: true });
const charted = { position: text(C), crs: "EPSG:4326" };
const at = (bearing: number, m: number) => direct(C.lat, C.lon, bearing, m);
const GNSS_U = Math.hypot(GNSS_HORIZONTAL_95_M, GNSS_ALONGSIDE_OFFSET_95_M); // 13.45 m

function gnss(bearing: number, m: number) {
  return { method: "gnss" as const, position: text(at(bearing, m)), observedAt: "2026-11-20T14:05:00Z" };
}

function expectError(body: unknown, field: string, error: string | RegExp) {
  const r = safeAssess(body);
  expect(r.ok).toBe(false);
  if (!r.ok) {
    expect(r.field).toBe(field);
    if (typeof error === "string") expect(r.error).toBe(error);
    else expect(r.error).toMatch(error);
  }
}

describe("swing radius", () => {
  it("from chain length and low-water depth: √(L² − d²) (TRADE.md: 30 m in 10 m → 28.3 m)", () => {
    const r = assess({ charted, mooring: { chainLengthM: 30, depthM: 10 }, observations: [gnss(0, 0)] });
    expect(r.swingRadiusM).toBeCloseTo(Math.sqrt(800), 12);
    expect(r.swingRadiusM).toBeCloseTo(28.3, 1);
    expect(r.swingRadiusSource).toBe("mooring");
    expect(r.mooring).toEqual({ chainLengthM: 30, depthM: 10 });
  });

  it("stated", () => {
    const r = assess({ charted, swingRadiusM: 25, observations: [gnss(0, 0)] });
    expect(r.swingRadiusM).toBe(25);
    expect(r.swingRadiusSource).toBe("stated");
    expect(r.mooring).toBeUndefined();
  });

  it("rejects depth ≥ chain length, both or neither", () => {
    expectError(
      { charted, mooring: { chainLengthM: 30, depthM: 30 }, observations: [gnss(0, 0)] },
      "mooring.depthM",
      "The depth (30 m) must be less than the chain length (30 m): with that chain the buoy could not swing at all",
    );
    expectError({ charted, mooring: { chainLengthM: 20, depthM: 25 }, observations: [gnss(0, 0)] }, "mooring.depthM", /must be less than the chain length/);
    expectError(
      { charted, swingRadiusM: 25, mooring: { chainLengthM: 30, depthM: 10 }, observations: [gnss(0, 0)] },
      "mooring",
      "Give either swingRadiusM or mooring (chainLengthM and depthM), not both",
    );
    expectError({ charted, observations: [gnss(0, 0)] }, "swingRadiusM", "Give the aid's swingRadiusM, or its mooring (chainLengthM and depthM at low water)");
    expectError({ charted, swingRadiusM: -1, observations: [gnss(0, 0)] }, "swingRadiusM", "swingRadiusM cannot be negative");
    expectError({ charted, mooring: { chainLengthM: 0, depthM: 0 }, observations: [gnss(0, 0)] }, "mooring.chainLengthM", "chainLengthM must be greater than 0");
  });
});

describe("verdicts (rule: off when d − U > S; within when d + U ≤ S; else inconclusive)", () => {
  const S = 25;
  it("within_swing_circle: a GNSS fix 5 m from the charted position", () => {
    const r = assess({ charted, swingRadiusM: S, observations: [gnss(90, 5)] });
    expect(r.verdict).toBe("within_swing_circle");
    expect(r.displacement.distanceM).toBeCloseTo(5, 3);
    expect(r.displacement.bearingTrueDeg).toBeCloseTo(90, 3);
    expect(r.combinedUncertaintyM).toBeCloseTo(GNSS_U, 3);
    expect(r.explanation).toBe(
      "The observed position is 5 m 090°T from the charted position; even allowing for the 13 m uncertainty (95%) it lies within the 25 m swing circle, so the aid appears on station.",
    );
  });

  it("inconclusive: 30 m off with a 13 m uncertainty", () => {
    const r = assess({ charted, swingRadiusM: S, observations: [gnss(200, 30)] });
    expect(r.verdict).toBe("inconclusive");
    expect(r.explanation).toBe(
      "The observed position is 30 m (0.02 M) 200°T from the charted position against a 25 m swing circle, but the 13 m uncertainty (95%) spans the circle's edge, so the observation cannot tell whether the aid is off station.",
    );
  });

  it("off_station: 148 m (0.08 M) east", () => {
    const r = assess({ charted, swingRadiusM: S, observations: [gnss(90, 148.16)] });
    expect(r.verdict).toBe("off_station");
    expect(r.explanation).toBe(
      "The observed position is 148 m (0.08 M) 090°T from the charted position, 123 m beyond the 25 m swing circle and more than the 13 m uncertainty (95%), so the aid appears off station.",
    );
  });

  it("the boundaries follow the rule exactly", () => {
    const U = GNSS_U;
    expect(assess({ charted, swingRadiusM: S, observations: [gnss(0, S - U - 0.01)] }).verdict).toBe("within_swing_circle");
    expect(assess({ charted, swingRadiusM: S, observations: [gnss(0, S - U + 0.01)] }).verdict).toBe("inconclusive");
    expect(assess({ charted, swingRadiusM: S, observations: [gnss(0, S + U - 0.01)] }).verdict).toBe("inconclusive");
    expect(assess({ charted, swingRadiusM: S, observations: [gnss(0, S + U + 0.01)] }).verdict).toBe("off_station");
  });

  it("a poor observation cannot confirm an aid on station, even right on the charted position", () => {
    const r = assess({ charted, swingRadiusM: 10, observations: [gnss(0, 0)] });
    expect(r.verdict).toBe("inconclusive");
    expect(r.explanation).toContain("at the charted position");
  });

  it("carries the rule and the caution", () => {
    const r = assess({ charted, swingRadiusM: S, observations: [gnss(0, 0)] });
    expect(r.rule).toBe(VERDICT_RULE);
    expect(r.caution).toBe(CAUTION);
  });
});

describe("the demo story: KS3 seen on radar 0.08 M east, the ferry alongside agrees", () => {
  const buoy = at(90, 0.08 * 1852);
  const own = direct(buoy.lat, buoy.lon, 225, 0.42 * 1852); // fishing boat SW of the buoy
  const radarLeg = inverse(own.lat, own.lon, buoy.lat, buoy.lon);
  const body = {
    charted,
    mooring: { chainLengthM: 30, depthM: 10 },
    observations: [
      {
        method: "radar",
        ownPosition: text(own),
        rangeNm: radarLeg.distanceNm,
        bearingDeg: radarLeg.initialBearingTrueDeg,
        bearingRef: "true",
        rangeScaleNm: 0.75,
        observedAt: "2026-11-20T14:05:00Z",
      },
      { method: "gnss", position: text(direct(buoy.lat, buoy.lon, 10, 6)), observedAt: "2026-11-20T15:40:00Z" },
    ],
  };

  it("combines both into one off-station estimate whose uncertainty is smaller than either", () => {
    const r = assess(body);
    expect(r.verdict).toBe("off_station");
    expect(r.observations.every((o) => o.consistent)).toBe(true);
    expect(r.estimate.observationsUsed).toBe(2);
    expect(r.estimate.uncertaintyM).toBeLessThan(Math.min(...r.observations.map((o) => o.uncertaintyM)));
    expect(r.displacement.distanceM).toBeGreaterThan(140);
    expect(r.displacement.distanceM).toBeLessThan(156);
    expect(r.displacement.bearingTrueDeg).toBeGreaterThan(85);
    expect(r.displacement.bearingTrueDeg).toBeLessThan(95);
    expect(r.displacement.distanceNm).toBeCloseTo(r.displacement.distanceM / 1852, 12);
    expect(r.explanation).toMatch(/^The combined estimate from 2 observations is 1\d\d m \(0\.08 M\) 0[89]\d°T from the charted position, \d+ m beyond the 28 m swing circle and more than the \d+ m uncertainty \(95%\), so the aid appears off station\.$/);
    expect(r.observations[0]!.figures).toMatchObject({ rangeError95M: 30, bearingError95Deg: 1, rangeScaleNm: 0.75 });
    expect(r.observations[0]!.declinationDeg).toBeUndefined();
  });
});

describe("several observations", () => {
  it("inverse-variance weighting shrinks the uncertainty (three equal fixes: ÷√3)", () => {
    const r = assess({ charted, swingRadiusM: 25, observations: [gnss(0, 3), gnss(120, 3), gnss(240, 3)] });
    expect(r.estimate.uncertaintyM).toBeCloseTo(GNSS_U / Math.sqrt(3), 3);
    expect(r.displacement.distanceM).toBeLessThan(1e-3);
    expect(r.observations.every((o) => o.consistent)).toBe(true);
    expect(r.observations.every((o) => o.normalisedResidual !== null && o.normalisedResidual < 3.035)).toBe(true);
  });

  it("weights a precise fix more than a poor one", () => {
    const precise = { ...gnss(90, 0), accuracyM: 2, offsetM: 1 };
    const poor = { ...gnss(90, 20), accuracyM: 20, offsetM: 10 };
    const r = assess({ charted, swingRadiusM: 25, observations: [precise, poor] });
    expect(r.displacement.distanceM).toBeLessThan(2);
  });

  it("flags the observation inconsistent with the rest (χ², 2 dof, 99%: d² > 9.21) and leaves it out", () => {
    const r = assess({ charted, swingRadiusM: 25, observations: [gnss(0, 2), gnss(90, 3), gnss(180, 2), gnss(45, 400)] });
    expect(r.observations.map((o) => o.consistent)).toEqual([true, true, true, false]);
    expect(r.observations[3]!.normalisedResidual!).toBeGreaterThan(Math.sqrt(9.21));
    expect(r.estimate.observationsUsed).toBe(3);
    expect(r.verdict).toBe("within_swing_circle");
    expect(r.explanation).toContain("(1 inconsistent observation left out)");
    expect(r.observations[3]!.residualM).toBeGreaterThan(390);
  });

  it("two observations that disagree are both flagged; the verdict stands only if each alone agrees", () => {
    const both = assess({ charted, swingRadiusM: 25, observations: [gnss(90, 300), gnss(270, 300)] });
    expect(both.observations.map((o) => o.consistent)).toEqual([false, false]);
    expect(both.verdict).toBe("off_station");
    expect(both.explanation).toContain("the observations disagree with each other, but each on its own puts the aid outside its 25 m swing circle");

    const split = assess({ charted, swingRadiusM: 25, observations: [gnss(90, 1), gnss(90, 300)] });
    expect(split.observations.map((o) => o.consistent)).toEqual([false, false]);
    expect(split.verdict).toBe("inconclusive");
    expect(split.explanation).toContain("the observations disagree with each other by more than their uncertainties allow");
  });
});

describe("charted positions in other CRSs", () => {
  it("ED50 with the default EPSG:1133 adds its 10 m accuracy to the combined uncertainty", () => {
    const ed50 = fromWgs84("EPSG:4230", C.lat, C.lon) as { lat: number; lon: number };
    const r = assess({ charted: { position: text(ed50), crs: "EPSG:4230" }, swingRadiusM: 25, observations: [gnss(0, 0)] });
    expect(r.charted.transformation).toEqual({ id: "EPSG:1133", name: "ED50 to WGS 84 (1)", accuracyM: 10 });
    expect(r.charted.uncertaintyM).toBe(10);
    expect(inverse(r.charted.lat, r.charted.lon, C.lat, C.lon).distanceM).toBeLessThan(0.001);
    expect(r.combinedUncertaintyM).toBeCloseTo(Math.hypot(GNSS_U, 10), 3);
    const alt = assess({ charted: { position: text(ed50), crs: "EPSG:4230", transformation: "EPSG:1311" }, swingRadiusM: 25, observations: [gnss(0, 0)] });
    expect(alt.charted.transformation?.id).toBe("EPSG:1311");
    expect(alt.charted.uncertaintyM).toBe(1);
  });

  it("a projected charted position is \"easting northing\" (ED50 / UTM zone 31N)", () => {
    const en = fromWgs84("EPSG:23031", C.lat, C.lon) as { easting: number; northing: number };
    const r = assess({ charted: { position: `${en.easting} ${en.northing}`, crs: "EPSG:23031" }, swingRadiusM: 25, observations: [gnss(0, 0)] });
    expect(inverse(r.charted.lat, r.charted.lon, C.lat, C.lon).distanceM).toBeLessThan(0.001);
    const r2 = assess({ charted: { position: { easting: en.easting, northing: en.northing }, crs: "EPSG:23031" }, swingRadiusM: 25, observations: [gnss(0, 0)] });
    expect(r2.charted).toEqual(r.charted);
  });

  it("a stated charted uncertainty combines with the transformation's", () => {
    const r = assess({ charted: { ...charted, uncertaintyM: 5 }, swingRadiusM: 25, observations: [gnss(0, 0)] });
    expect(r.charted.uncertaintyM).toBe(5);
    expect(r.charted.transformation).toBeNull();
  });
});

describe("the issue's request shape, verbatim", () => {
  it("works and answers in the documented response shape", () => {
    const r = assess({
      charted: { position: "55°12.30′N 003°01.10′E", crs: "EPSG:4230" },
      swingRadiusM: 25,
      observations: [
        { method: "gnss", position: "55°12.28′N 003°01.02′E", observedAt: "2026-11-20T14:05:00Z" },
        { method: "radar", ownPosition: "55°12.05′N 003°00.70′E", rangeNm: 0.42, bearingDeg: 47, bearingRef: "true", rangeScaleNm: 0.75, observedAt: "2026-11-20T14:10:00Z" },
        { method: "compass", ownPosition: "55°12.15′N 003°00.75′E", bearingMagneticDeg: 95, distanceM: 300, observedAt: "2026-11-20T14:20:00Z" },
      ],
    });
    expect(Object.keys(r).sort()).toEqual(
      ["caution", "charted", "combinedUncertaintyM", "displacement", "estimate", "explanation", "observations", "rule", "swingRadiusM", "swingRadiusSource", "verdict"].sort(),
    );
    expect(Object.keys(r.charted).sort()).toEqual(["crs", "lat", "lon", "transformation", "uncertaintyM"]);
    for (const o of r.observations) {
      expect(o).toHaveProperty("lat");
      expect(o).toHaveProperty("lon");
      expect(o).toHaveProperty("uncertaintyM");
      expect(o).toHaveProperty("consistent");
    }
    expect(r.observations[2]!.declinationDeg).toBeGreaterThan(0);
    expect(r.observations[2]!.figures.magneticModel).toBe("WMM2025");
    expect(Object.keys(r.estimate).sort()).toEqual(["lat", "lon", "observationsUsed", "uncertaintyM"]);
    expect(Object.keys(r.displacement).sort()).toEqual(["bearingTrueDeg", "distanceM", "distanceNm"]);
    expect(["within_swing_circle", "inconclusive", "off_station"]).toContain(r.verdict);
  });
});

describe("rejections name the field", () => {
  const ok = { charted, swingRadiusM: 25, observations: [gnss(0, 0)] };
  const radar = { method: "radar", ownPosition: "55.19 3.0", rangeNm: 0.42, bearingDeg: 47, rangeScaleNm: 0.75 };

  it("whole-body problems", () => {
    for (const body of [null, "text", 42, [], undefined]) {
      const r = safeAssess(body);
      expect(r).toMatchObject({ ok: false, field: "" });
    }
    expectError({ ...ok, extra: 1 }, "extra", "Unknown field: extra");
    expectError({ swingRadiusM: 25, observations: [gnss(0, 0)] }, "charted", "charted is required");
    expectError({ charted, swingRadiusM: 25, observations: [] }, "observations", "Give at least one observation");
    expectError({ charted, swingRadiusM: 25 }, "observations", "observations must be a list");
  });

  it("positions", () => {
    expectError({ ...ok, charted: { position: "95N 1E" } }, "charted.position", "Latitude 95° is beyond 90°");
    expectError({ ...ok, charted: { position: 12 } }, "charted.position", /Give a position as text/);
    expectError({ ...ok, charted: { position: "55N 3E", crs: "EPSG:3857" } }, "charted.crs", /EPSG:3857 is not supported/);
    expectError({ ...ok, charted: { position: "55N 3E", crs: "EPSG:4230", transformation: "EPSG:1314" } }, "charted.transformation", /EPSG:1314 is not a transformation from ED50/);
    expectError({ ...ok, charted: { position: "55°N 3°E", crs: "EPSG:23031" } }, "charted.position", /EPSG:23031 is projected: give "easting northing" in metres/);
    expectError({ ...ok, charted: { position: { lat: 91, lon: 0 } } }, "charted.position", "Latitude 91° is beyond 90°");
    expectError({ ...ok, observations: [{ method: "gnss", position: "50°61′N 1°W" }] }, "observations.0.position", "Minutes must be less than 60 (latitude: 61′)");
    expectError({ ...ok, observations: [gnss(0, 0), { ...radar, ownPosition: "" }] }, "observations.1.ownPosition", "Enter a position");
    expectError({ ...ok, observations: [{ method: "gnss", position: { easting: 1, northing: 2 } }] }, "observations.0.position", /This position is WGS 84/);
    expectError({ ...ok, observations: [{ method: "gnss", position: { lat: 55, lon: 181 } }] }, "observations.0.position", "Longitude 181° is beyond 180°");
    expectError({ ...ok, observations: [{ method: "gnss", position: "5".repeat(201) }] }, "observations.0.position", "This position is too long");
    expectError({ ...ok, charted: { position: { lat: 55, lon: 3 }, crs: "EPSG:23031" } }, "charted.position", "EPSG:23031 is projected: give an easting and northing in metres");
  });

  it("observations", () => {
    expectError({ ...ok, observations: [{ method: "sextant" }] }, "observations.0.method", 'method must be "gnss", "radar" or "compass"');
    expectError({ ...ok, observations: [{ ...radar, rangeNm: 0.9 }] }, "observations.0.rangeNm", "The range (0.9 M) is beyond the range scale in use (0.75 M)");
    expectError({ ...ok, observations: [{ ...radar, rangeNm: -1 }] }, "observations.0.rangeNm", "rangeNm must be greater than 0");
    expectError({ ...ok, observations: [{ ...radar, rangeNm: "0.4" }] }, "observations.0.rangeNm", "rangeNm must be a number of nautical miles");
    expectError({ ...ok, observations: [{ ...radar, bearingDeg: 361 }] }, "observations.0.bearingDeg", "bearingDeg must be from 0 to 360°");
    expectError({ ...ok, observations: [{ ...radar, bearingRef: "relative" }] }, "observations.0.headingTrueDeg", "A relative bearing needs the ship's heading: give headingTrueDeg");
    expectError({ ...ok, observations: [{ ...radar, bearingRef: "magnetic" }] }, "observations.0.bearingRef", 'bearingRef must be "true" or "relative"');
    expectError({ ...ok, observations: [{ ...radar, rangeScaleNm: 0 }] }, "observations.0.rangeScaleNm", "rangeScaleNm must be greater than 0");
    const compass = { method: "compass", ownPosition: "55.19 3.0", bearingMagneticDeg: 95, distanceM: 300, observedAt: "2026-11-20T14:20:00Z" };
    expectError({ ...ok, observations: [{ ...compass, observedAt: undefined }] }, "observations.0.observedAt", "Give observedAt, the date and time of the bearing: magnetic variation depends on it");
    expectError({ ...ok, observations: [{ ...compass, observedAt: "2026-11-20 14:20" }] }, "observations.0.observedAt", "observedAt must be an ISO 8601 date-time with a time zone, e.g. 2026-11-20T14:05:00Z");
    expectError(
      { ...ok, observations: [{ ...compass, observedAt: "2030-02-01T00:00:00Z" }] },
      "observations.0.observedAt",
      "2030-02-01 is after the World Magnetic Model 2025 validity (to 2030-01-01): the magnetic bearing cannot be converted to true",
    );
    expectError({ ...ok, observations: [{ ...compass, observedAt: "2019-02-01T00:00:00Z" }] }, "observations.0.observedAt", "2019-02-01 is before 2020-01-01, the earliest date the magnetic models cover");
    expectError({ ...ok, observations: [{ ...compass, distanceM: 0 }] }, "observations.0.distanceM", "distanceM must be greater than 0");
    expectError({ ...ok, observations: [{ ...compass, colour: "red" }] }, "observations.0.colour", "Unknown field: colour");
    expectError({ ...ok, observations: Array.from({ length: 21 }, () => gnss(0, 0)) }, "observations", "At most 20 observations per assessment");
    expectError({ ...ok, observations: [{ ...gnss(0, 0), accuracyM: 0 }] }, "observations.0.accuracyM", "accuracyM must be greater than 0");
    expectError({ ...ok, observations: [{ ...gnss(0, 0), offsetM: "5" }] }, "observations.0.offsetM", "offsetM must be a number of metres");
    expectError({ ...ok, observations: [{ ...radar, bearingDeg: "N" }] }, "observations.0.bearingDeg", "bearingDeg must be a number of degrees");
    expectError({ ...ok, swingRadiusM: 20_000 }, "swingRadiusM", "swingRadiusM must be at most 10,000 m");
  });

  it("assess() throws GeoInputError with the field; fieldErrors lists every problem", () => {
    expect(() => assess({ ...ok, swingRadiusM: -1 })).toThrow(GeoInputError);
    const parsed = assessmentInputSchema.safeParse({ ...ok, charted: { position: "95N 1E" }, observations: [{ ...radar, rangeNm: 0.9 }] });
    expect(parsed.success).toBe(false);
    if (!parsed.success) {
      expect(fieldErrors(parsed.error)).toEqual({
        "charted.position": "Latitude 95° is beyond 90°",
        "observations.0.rangeNm": "The range (0.9 M) is beyond the range scale in use (0.75 M)",
      });
    }
  });
});
