import { describe, expect, it } from "vitest";
import {
  addCov,
  CHI2_2DOF_99,
  computeRadius95Factor,
  covAlongCross,
  covFromRadius95,
  invert,
  K95_2D,
  mahalanobis2,
  principalSigmas,
  radius95,
  RADIUS95_TABLE,
  radius95Factor,
  Z95_1D,
} from "~/lib/geo/uncertainty";

/** Deterministic PRNG (mulberry32) so the Monte Carlo check gives the same draw every run. */
function mulberry32(seed: number) {
  return () => {
    seed |= 0;
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

describe("95% radius of an elliptical error", () => {
  it("matches the closed forms at both ends", () => {
    // Circular: Rayleigh distribution, R95 = σ√(−2 ln 0.05) = 2.4477σ.
    expect(radius95Factor(1)).toBeCloseTo(2.447747, 4);
    expect(K95_2D).toBeCloseTo(2.447747, 6);
    // All error on one axis: the 1-D normal 95% point, 1.95996σ.
    expect(radius95Factor(0)).toBeCloseTo(1.959964, 5);
    expect(Z95_1D).toBeCloseTo(1.959964, 6);
    // Monotonic in between.
    for (let k = 0; k < 1; k += 0.05) expect(radius95Factor(k + 0.05)).toBeGreaterThanOrEqual(radius95Factor(k));
  });

  it("the built-in table is what the numerical integration gives", () => {
    RADIUS95_TABLE.forEach((v, i) => {
      expect(Math.abs(computeRadius95Factor(i / (RADIUS95_TABLE.length - 1)) - v)).toBeLessThan(2e-6);
    });
  });

  it("holds 95% of simulated errors for an ellipse with axes 2:1", () => {
    const rnd = mulberry32(20261120);
    const cov = covAlongCross(30, 40, 20);
    const [s1, s2] = principalSigmas(cov);
    const R = radius95(cov);
    const a = (30 * Math.PI) / 180;
    let inside = 0;
    const N = 200_000;
    for (let i = 0; i < N; i++) {
      const u1 = rnd() || 1e-12;
      const u2 = rnd();
      const g1 = Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
      const g2 = Math.sqrt(-2 * Math.log(u1)) * Math.sin(2 * Math.PI * u2);
      const e = g1 * s1 * Math.sin(a) + g2 * s2 * Math.cos(a);
      const n = g1 * s1 * Math.cos(a) - g2 * s2 * Math.sin(a);
      if (e * e + n * n <= R * R) inside++;
    }
    expect(inside / N).toBeGreaterThan(0.947);
    expect(inside / N).toBeLessThan(0.953);
  });

  it("isotropic radii add in quadrature", () => {
    expect(radius95(addCov(covFromRadius95(9), covFromRadius95(10)))).toBeCloseTo(Math.hypot(9, 10), 3);
  });

  it("orients along/cross errors by the bearing (east for 090°)", () => {
    const c = covAlongCross(90, 30, 0);
    expect(c[0]).toBeCloseTo((30 / Z95_1D) ** 2, 9);
    expect(c[2]).toBeCloseTo(0, 9);
    expect(c[1]).toBeCloseTo(0, 9);
  });

  it("inverts and measures Mahalanobis distance", () => {
    const c = covFromRadius95(K95_2D); // σ = 1 per axis
    expect(mahalanobis2(3, 4, c)).toBeCloseTo(25, 9);
    expect(() => invert([0, 0, 0])).toThrow(RangeError);
    expect(CHI2_2DOF_99).toBeCloseTo(9.2103, 4);
  });
});
