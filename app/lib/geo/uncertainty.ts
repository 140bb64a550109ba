/**
 * Horizontal uncertainty arithmetic, in a local east/north plane (metres).
 *
 * Model (documented for the API and the tools page):
 * - Every error figure we are given is a 95% figure. A one-dimensional 95% figure (radar range
 *   error, bearing error converted to a cross-range distance, estimated-distance error) becomes
 *   a standard deviation by dividing by 1.95996 (normal distribution). A circular horizontal 95%
 *   radius (GNSS) becomes a per-axis standard deviation by dividing by 2.44775
 *   (= √(−2 ln 0.05), the Rayleigh 95% point).
 * - Independent components add as covariance matrices.
 * - A covariance becomes a "95% horizontal radius" as the radius of the circle, centred on the
 *   position, that holds 95% of the bivariate normal distribution: R95 = σ₁·f(σ₂/σ₁) with
 *   σ₁ ≥ σ₂ the principal standard deviations; f(1) = 2.4477 (circular) and f(0) = 1.9600
 *   (all error along one axis). f is tabulated once by numerical integration.
 */

export const Z95_1D = 1.959963984540054;
export const K95_2D = Math.sqrt(-2 * Math.log(0.05)); // 2.4477468...

/** Symmetric 2×2 covariance [σee, σen, σnn] in m². */
export type Cov2 = readonly [number, number, number];

export const ZERO_COV: Cov2 = [0, 0, 0];

export function addCov(a: Cov2, b: Cov2): Cov2 {
  return [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
}

export function scaleCov(a: Cov2, k: number): Cov2 {
  return [a[0] * k, a[1] * k, a[2] * k];
}

/** Isotropic covariance from a circular 95% radius. */
export function covFromRadius95(r95: number): Cov2 {
  const s = r95 / K95_2D;
  return [s * s, 0, s * s];
}

/**
 * Covariance of independent along-bearing and cross-bearing errors (1-D 95% figures) for a
 * direction `bearingDeg` (true, clockwise from north).
 */
export function covAlongCross(bearingDeg: number, along95: number, cross95: number): Cov2 {
  const a = (bearingDeg * Math.PI) / 180;
  const ue = Math.sin(a);
  const un = Math.cos(a);
  const sa = (along95 / Z95_1D) ** 2;
  const sc = (cross95 / Z95_1D) ** 2;
  // along unit (ue, un); cross unit (un, -ue)
  return [sa * ue * ue + sc * un * un, sa * ue * un - sc * un * ue, sa * un * un + sc * ue * ue];
}

export function invert(c: Cov2): Cov2 {
  const det = c[0] * c[2] - c[1] * c[1];
  if (!(det > 0)) throw new RangeError("covariance is not positive definite");
  return [c[2] / det, -c[1] / det, c[0] / det];
}

/** Principal standard deviations (σ₁ ≥ σ₂). */
export function principalSigmas(c: Cov2): [number, number] {
  const tr = c[0] + c[2];
  const d = Math.sqrt(((c[0] - c[2]) / 2) ** 2 + c[1] * c[1]);
  const l1 = tr / 2 + d;
  const l2 = Math.max(tr / 2 - d, 0);
  return [Math.sqrt(l1), Math.sqrt(l2)];
}

/** Mahalanobis distance squared of an offset (e, n) under covariance c. */
export function mahalanobis2(e: number, n: number, c: Cov2): number {
  const w = invert(c);
  return e * e * w[0] + 2 * e * n * w[1] + n * n * w[2];
}

// --- 95% radius of an elliptical bivariate normal ------------------------------------------------

/** Standard normal CDF. */
function normCdf(x: number): number {
  return 0.5 * erfc(-x / Math.SQRT2);
}

/** Complementary error function (Numerical Recipes erfcc-style Chebyshev fit, |ε| < 1.2e-7). */
function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const r =
    t *
    Math.exp(
      -z * z -
        1.26551223 +
        t * (1.00002368 + t * (0.37409196 + t * (0.09678418 + t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))),
    );
  return x >= 0 ? r : 2 - r;
}

/**
 * P(point within radius R) for σ₁ = 1, σ₂ = k: ∫ φ(x)·[2Φ(√(R²−x²)/k) − 1] dx over |x| < R,
 * with x = R sin t to keep the integrand smooth; Simpson's rule.
 */
function probabilityWithin(R: number, k: number): number {
  if (k === 0) return 2 * normCdf(R) - 1;
  const N = 400;
  const h = Math.PI / N;
  let sum = 0;
  for (let i = 0; i <= N; i++) {
    const t = -Math.PI / 2 + i * h;
    const x = R * Math.sin(t);
    const y = R * Math.cos(t);
    const phi = Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI);
    const v = phi * (2 * normCdf(y / k) - 1) * R * Math.cos(t);
    sum += (i === 0 || i === N ? 1 : i % 2 === 1 ? 4 : 2) * v;
  }
  return (sum * h) / 3;
}

/** f(k) by bisection on probabilityWithin (used by the tests to check the table below). */
export function computeRadius95Factor(k: number): number {
  let lo = 1.9;
  let hi = 2.5;
  for (let i = 0; i < 50; i++) {
    const mid = (lo + hi) / 2;
    if (probabilityWithin(mid, k) < 0.95) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

/**
 * f(k) at k = 0, 0.025, …, 1, computed once with computeRadius95Factor (2000-step Simpson,
 * 60 bisections) and written out so requests do not pay for the integration; the unit tests
 * recompute every entry.
 */
export const RADIUS95_TABLE: readonly number[] = [
  1.959964, 1.960123, 1.960603, 1.961404, 1.96253, 1.963986, 1.965778, 1.967916, 1.970408, 1.973266, 1.976505, 1.980142, 1.984196,
  1.988692, 1.993656, 1.999124, 2.005137, 2.011747, 2.019017, 2.027025, 2.035859, 2.045614, 2.056384, 2.068257, 2.081304, 2.095579,
  2.111112, 2.127915, 2.145981, 2.165288, 2.185802, 2.207483, 2.230287, 2.254167, 2.279075, 2.304967, 2.331798, 2.359528, 2.38812,
  2.417536, 2.447747,
];
const TABLE_STEPS = RADIUS95_TABLE.length - 1;

/** f(k) = R95/σ₁ for principal ratio k = σ₂/σ₁ in [0, 1] (linear interpolation in the table). */
export function radius95Factor(k: number): number {
  const t = RADIUS95_TABLE;
  const x = Math.min(Math.max(k, 0), 1) * TABLE_STEPS;
  const i = Math.min(Math.floor(x), TABLE_STEPS - 1);
  const f = x - i;
  return t[i]! * (1 - f) + t[i + 1]! * f;
}

/** Radius of the circle holding 95% of a bivariate normal with covariance c. */
export function radius95(c: Cov2): number {
  const [s1, s2] = principalSigmas(c);
  if (s1 === 0) return 0;
  return s1 * radius95Factor(s2 / s1);
}

/** χ² with 2 degrees of freedom: the 99% point, −2 ln 0.01 = 9.2103. */
export const CHI2_2DOF_99 = -2 * Math.log(0.01);
