/**
 * Displacement assessment: is a floating aid where the chart says, given its swing circle and
 * the uncertainty of what was observed?
 *
 * Method (documented in the API docs and on the tools page):
 * 1. The charted position is converted to WGS 84 with the chosen datum transformation. Its 95%
 *    uncertainty is the transformation's EPSG accuracy (treated as a 95% figure — our reading)
 *    combined in quadrature with any stated charted uncertainty.
 * 2. Each observation becomes a position with a covariance (observation.ts).
 * 3. Several observations combine into one inverse-variance-weighted estimate (generalised least
 *    squares on local east/north offsets: Σ = (Σᵢ Wᵢ)⁻¹, x = Σ Σᵢ Wᵢ xᵢ with Wᵢ = Σᵢ⁻¹).
 * 4. Consistency: with three or more observations, each is compared with the estimate from the
 *    others: d² = rᵀ (Σᵢ + Σ₋ᵢ)⁻¹ r. The worst is flagged (`consistent: false`) and left out when
 *    d² exceeds 9.21, the 99% point of χ² with 2 degrees of freedom; repeat. Two observations
 *    that fail the same test against each other are both flagged, since neither can be
 *    preferred.
 * 5. Verdict, with d the distance from charted to estimate, S the swing radius and U the
 *    combined 95% uncertainty (estimate and charted position):
 *      off_station          when d − U > S (outside the swing circle even allowing for U);
 *      within_swing_circle  when d + U ≤ S (inside it even allowing for U);
 *      inconclusive         otherwise (the circle's edge lies within the uncertainty).
 *    When the observations disagree with each other, a verdict stands only if every
 *    observation on its own leads to it; otherwise the verdict is inconclusive.
 */
import { toWgs84 } from "./crs";
import { GeoInputError } from "./errors";
import { fromLocalEN, METRES_PER_NAUTICAL_MILE, normaliseBearing, toLocalEN } from "./geodesy";
import { observationToPosition, type ObservedPosition } from "./observation";
import { formatBearingTrue } from "./positions";
import { assessmentInputSchema, firstFieldError, type FieldError, type NormalisedAssessmentInput } from "./schemas";
import { addCov, CHI2_2DOF_99, type Cov2, covFromRadius95, invert, mahalanobis2, radius95 } from "./uncertainty";

export type Verdict = "within_swing_circle" | "inconclusive" | "off_station";

export const CAUTION =
  "Tidewire informs; it does not replace official charts, official notices, local regulations or a proper lookout.";

export const VERDICT_RULE =
  "off_station when distance − uncertainty > swing radius; within_swing_circle when distance + uncertainty ≤ swing radius; otherwise inconclusive (uncertainty is the combined 95% radius of the estimate and the charted position).";

export interface AssessedObservation {
  method: ObservedPosition["method"];
  lat: number;
  lon: number;
  uncertaintyM: number;
  declinationDeg?: number;
  consistent: boolean;
  /** √d² from the consistency test (null when there is nothing to compare with). */
  normalisedResidual: number | null;
  /** Distance from the final estimate, metres. */
  residualM: number;
  figures: Record<string, number | string>;
}

export interface AssessmentResponse {
  charted: {
    lat: number;
    lon: number;
    crs: string;
    transformation: { id: string; name: string; accuracyM: number } | null;
    uncertaintyM: number;
  };
  observations: AssessedObservation[];
  estimate: { lat: number; lon: number; uncertaintyM: number; observationsUsed: number };
  displacement: { distanceM: number; distanceNm: number; bearingTrueDeg: number };
  swingRadiusM: number;
  swingRadiusSource: "stated" | "mooring";
  mooring?: { chainLengthM: number; depthM: number };
  combinedUncertaintyM: number;
  verdict: Verdict;
  explanation: string;
  rule: string;
  caution: string;
}

interface Local {
  e: number;
  n: number;
  cov: Cov2;
}

function combine(items: Local[]): Local {
  let w: [number, number, number] = [0, 0, 0];
  let be = 0;
  let bn = 0;
  for (const it of items) {
    const wi = invert(it.cov);
    w = [w[0] + wi[0], w[1] + wi[1], w[2] + wi[2]];
    be += wi[0] * it.e + wi[1] * it.n;
    bn += wi[1] * it.e + wi[2] * it.n;
  }
  const cov = invert(w);
  return { e: cov[0] * be + cov[1] * bn, n: cov[1] * be + cov[2] * bn, cov };
}

function leaveOneOut(items: Local[], members: number[], i: number): number {
  const others = combine(members.filter((j) => j !== i).map((j) => items[j]!));
  const it = items[i]!;
  return mahalanobis2(it.e - others.e, it.n - others.n, addCov(it.cov, others.cov));
}

function verdictFor(distanceM: number, uncertaintyM: number, swingM: number): Verdict {
  if (distanceM - uncertaintyM > swingM) return "off_station";
  if (distanceM + uncertaintyM <= swingM) return "within_swing_circle";
  return "inconclusive";
}

function m(x: number): string {
  if (x < 10) return `${(Math.round(x * 10) / 10).toFixed(1).replace(/\.0$/, "")} m`;
  return `${String(Math.round(x)).replace(/\B(?=(\d{3})+(?!\d))/g, ",")} m`;
}
function nm(x: number): string {
  return `${x.toFixed(2)} M`;
}

function explain(v: Verdict, d: number, brg: number, S: number, U: number, n: number, disagreement: boolean, flagged: number): string {
  const inNm = d >= 0.005 * 1852 ? ` (${nm(d / 1852)})` : "";
  const where = d < 0.05 ? "at the charted position" : `${m(d)}${inNm} ${formatBearingTrue(brg)} from the charted position`;
  const subject = n > 1 ? `The combined estimate from ${n} observations is` : "The observed position is";
  const left = flagged > 0 ? ` (${flagged} inconsistent observation${flagged > 1 ? "s" : ""} left out)` : "";
  if (disagreement) {
    return v === "inconclusive"
      ? `${subject} ${where}, but the observations disagree with each other by more than their uncertainties allow, so they cannot settle whether the aid is within its ${m(S)} swing circle.`
      : `${subject} ${where}; the observations disagree with each other, but each on its own puts the aid ${v === "off_station" ? "outside" : "inside"} its ${m(S)} swing circle.`;
  }
  switch (v) {
    case "off_station":
      return `${subject} ${where}${left}, ${m(d - S)} beyond the ${m(S)} swing circle and more than the ${m(U)} uncertainty (95%), so the aid appears off station.`;
    case "within_swing_circle":
      return `${subject} ${where}${left}; even allowing for the ${m(U)} uncertainty (95%) it lies within the ${m(S)} swing circle, so the aid appears on station.`;
    default:
      return `${subject} ${where}${left} against a ${m(S)} swing circle, but the ${m(U)} uncertainty (95%) spans the circle's edge, so ${n > 1 ? "the observations cannot" : "the observation cannot"} tell whether the aid is off station.`;
  }
}

/** Run an assessment on already-validated input (see assessmentInputSchema). */
export function assessNormalised(input: NormalisedAssessmentInput): AssessmentResponse {
  const { charted, swing } = input;
  const c = toWgs84(charted.crs, charted.coord, { transformation: charted.transformation.id, field: "charted.position" });
  const tfAcc = charted.transformation.id === "identity" ? 0 : charted.transformation.accuracyM;
  const chartedU = Math.hypot(tfAcc, charted.uncertaintyM);

  const observed = input.observations.map((o) => observationToPosition(o));
  const items: Local[] = observed.map((p) => {
    const l = toLocalEN(c.lat, c.lon, p.lat, p.lon);
    return { e: l.e, n: l.n, cov: p.covariance };
  });

  const residual2: (number | null)[] = items.map(() => null);
  const flagged = new Set<number>();
  let members = items.map((_, i) => i);
  let disagreement = false;

  while (members.length >= 3) {
    let worst = -1;
    let worstD2 = -1;
    const d2s = members.map((i) => leaveOneOut(items, members, i));
    d2s.forEach((d2, k) => {
      residual2[members[k]!] = d2;
      if (d2 > worstD2) {
        worstD2 = d2;
        worst = members[k]!;
      }
    });
    if (worstD2 <= CHI2_2DOF_99) break;
    flagged.add(worst);
    members = members.filter((i) => i !== worst);
  }
  if (members.length === 2) {
    const [a, b] = members as [number, number];
    const d2 = mahalanobis2(items[a]!.e - items[b]!.e, items[a]!.n - items[b]!.n, addCov(items[a]!.cov, items[b]!.cov));
    residual2[a] = d2;
    residual2[b] = d2;
    if (d2 > CHI2_2DOF_99) {
      disagreement = true;
      flagged.add(a);
      flagged.add(b);
    }
  }

  const est = combine(members.map((i) => items[i]!));
  const estLL = fromLocalEN(c.lat, c.lon, est.e, est.n);
  // est is in azimuthal-equidistant coordinates about the charted position, so its distance and
  // bearing from the charted position are exact without another geodesic solution.
  const distanceM = Math.hypot(est.e, est.n);
  const disp = {
    distanceM,
    distanceNm: distanceM / METRES_PER_NAUTICAL_MILE,
    initialBearingTrueDeg: normaliseBearing((Math.atan2(est.e, est.n) * 180) / Math.PI),
  };
  const chartedCov = covFromRadius95(chartedU);
  const U = radius95(addCov(est.cov, chartedCov));
  let verdict = verdictFor(disp.distanceM, U, swing.radiusM);

  if (disagreement) {
    const each = members.map((i) => {
      const it = items[i]!;
      return verdictFor(Math.hypot(it.e, it.n), radius95(addCov(it.cov, chartedCov)), swing.radiusM);
    });
    verdict = each.every((v) => v === each[0]) ? each[0]! : "inconclusive";
  }

  const observations: AssessedObservation[] = observed.map((p, i) => {
    const it = items[i]!;
    const out: AssessedObservation = {
      method: p.method,
      lat: p.lat,
      lon: p.lon,
      uncertaintyM: p.uncertaintyM,
      consistent: !flagged.has(i),
      normalisedResidual: residual2[i] === null ? null : Math.sqrt(residual2[i]!),
      residualM: Math.hypot(it.e - est.e, it.n - est.n),
      figures: p.figures,
    };
    if (p.declinationDeg !== undefined) out.declinationDeg = p.declinationDeg;
    return out;
  });

  const used = members.length;
  const response: AssessmentResponse = {
    charted: {
      lat: c.lat,
      lon: c.lon,
      crs: charted.crs.id,
      transformation:
        charted.transformation.id === "identity"
          ? null
          : { id: charted.transformation.id, name: charted.transformation.name, accuracyM: charted.transformation.accuracyM },
      uncertaintyM: chartedU,
    },
    observations,
    estimate: { lat: estLL.lat, lon: estLL.lon, uncertaintyM: radius95(est.cov), observationsUsed: used },
    displacement: { distanceM: disp.distanceM, distanceNm: disp.distanceNm, bearingTrueDeg: disp.initialBearingTrueDeg },
    swingRadiusM: swing.radiusM,
    swingRadiusSource: swing.source,
    combinedUncertaintyM: U,
    verdict,
    explanation: explain(verdict, disp.distanceM, disp.initialBearingTrueDeg, swing.radiusM, U, used, disagreement, disagreement ? 0 : flagged.size),
    rule: VERDICT_RULE,
    caution: CAUTION,
  };
  if (swing.source === "mooring") response.mooring = { chainLengthM: swing.chainLengthM!, depthM: swing.depthM! };
  return response;
}

/**
 * The single entry point: takes exactly the JSON body of POST /api/v1/assessments and returns
 * the response body. Throws GeoInputError (with the field path) for invalid input.
 */
export function assess(input: unknown): AssessmentResponse {
  const parsed = assessmentInputSchema.safeParse(input);
  if (!parsed.success) {
    const f = firstFieldError(parsed.error);
    throw new GeoInputError(f.error, f.field, "invalid_input");
  }
  return assessNormalised(parsed.data);
}

export type SafeAssessResult = { ok: true; value: AssessmentResponse } | ({ ok: false } & FieldError);

/** assess() without throwing for bad input. */
export function safeAssess(input: unknown): SafeAssessResult {
  try {
    return { ok: true, value: assess(input) };
  } catch (e) {
    if (e instanceof GeoInputError) return { ok: false, error: e.message, field: e.field };
    throw e;
  }
}
