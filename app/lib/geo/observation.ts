/**
 * Observation → position, each with a 95% horizontal uncertainty and the figures behind it.
 *
 * Error model (all figures are 95%; see uncertainty.ts for how they combine):
 * - GNSS: 9 m horizontal — GPS Standard Positioning Service Performance Standard, 5th edition
 *   (2020), global average horizontal accuracy (quoted from memory; the standard gives 8–9 m
 *   depending on edition, we take the larger). An observer "alongside" the mark adds the
 *   distance between antenna and mark: 10 m by default (our assumption: about a boat's length;
 *   give `offsetM` when known).
 * - Radar: range error the larger of 30 m or 1% of the range scale in use, bearing error 1°
 *   (IMO performance standards for radar equipment, resolution MSC.192(79)), plus the own-ship
 *   GNSS error. A relative bearing adds a heading error of 1° (our assumption for a gyro or GNSS
 *   heading sensor).
 * - Hand-bearing compass: ±2° (common practice), plus 1° for the magnetic model and local
 *   anomalies (our assumption, rounded up from the World Magnetic Model's published global
 *   declination uncertainty of a few tenths of a degree, from memory), combined as √(2² + 1²);
 *   an estimated distance ±25% (our assumption for a distance judged by eye; give
 *   `distanceUncertaintyM` when measured); plus the own-ship GNSS error.
 * Bearing errors become cross-range distances: range × tan(bearing error).
 */
import { direct, METRES_PER_NAUTICAL_MILE, normaliseBearing } from "./geodesy";
import { magneticDeclination, magneticToTrue } from "./magnetic";
import { addCov, covAlongCross, covFromRadius95, type Cov2, radius95 } from "./uncertainty";

/** GPS SPS Performance Standard, 5th ed. (2020), horizontal 95%, global average — from memory. */
export const GNSS_HORIZONTAL_95_M = 9;
/** Antenna-to-mark distance when "alongside" — Tidewire's assumption (a boat's length). */
export const GNSS_ALONGSIDE_OFFSET_95_M = 10;
/** IMO MSC.192(79): range error within 30 m or 1% of the range scale, whichever is greater. */
export const RADAR_RANGE_ERROR_MIN_M = 30;
export const RADAR_RANGE_ERROR_SCALE_FRACTION = 0.01;
/** IMO MSC.192(79): bearing error within 1°. */
export const RADAR_BEARING_ERROR_DEG = 1;
/** Heading sensor error added to relative radar bearings — Tidewire's assumption. */
export const HEADING_ERROR_95_DEG = 1;
/** Hand-bearing compass, about ±2° (common practice). */
export const HAND_COMPASS_ERROR_95_DEG = 2;
/** Magnetic model and local anomaly allowance — Tidewire's assumption (see header). */
export const DECLINATION_ERROR_95_DEG = 1;
/** Distance judged by eye, ±25% — Tidewire's assumption. */
export const ESTIMATED_DISTANCE_FRACTION_95 = 0.25;

export type ObservationMethod = "gnss" | "radar" | "compass";

export interface GnssObservation {
  method: "gnss";
  lat: number;
  lon: number;
  /** 95% horizontal accuracy of the fix (default GNSS_HORIZONTAL_95_M). */
  accuracyM?: number;
  /** 95% bound on the distance between antenna and mark (default GNSS_ALONGSIDE_OFFSET_95_M). */
  offsetM?: number;
  observedAt?: Date;
}

export interface RadarObservation {
  method: "radar";
  ownLat: number;
  ownLon: number;
  rangeNm: number;
  bearingDeg: number;
  bearingRef: "true" | "relative";
  headingTrueDeg?: number;
  rangeScaleNm: number;
  ownAccuracyM?: number;
  observedAt?: Date;
}

export interface CompassObservation {
  method: "compass";
  ownLat: number;
  ownLon: number;
  bearingMagneticDeg: number;
  distanceM: number;
  /** 95% error of the distance (default 25% of distanceM). */
  distanceUncertaintyM?: number;
  ownAccuracyM?: number;
  observedAt: Date;
}

export type Observation = GnssObservation | RadarObservation | CompassObservation;

export interface ObservedPosition {
  method: ObservationMethod;
  lat: number;
  lon: number;
  /** 95% horizontal radius. */
  uncertaintyM: number;
  /** Covariance [ee, en, nn] in m² (1σ), local east/north at the observed position. */
  covariance: Cov2;
  /** Present when a magnetic bearing was converted to true. */
  declinationDeg?: number;
  /** The numbers behind the position and its uncertainty. */
  figures: Record<string, number | string>;
}

function ownCov(accuracyM: number | undefined): { cov: Cov2; r95: number } {
  const r95 = accuracyM ?? GNSS_HORIZONTAL_95_M;
  return { cov: covFromRadius95(r95), r95 };
}

export function radarRangeError95M(rangeScaleNm: number): number {
  return Math.max(RADAR_RANGE_ERROR_MIN_M, RADAR_RANGE_ERROR_SCALE_FRACTION * rangeScaleNm * METRES_PER_NAUTICAL_MILE);
}

function crossRange(rangeM: number, bearingErrorDeg: number): number {
  return rangeM * Math.tan((bearingErrorDeg * Math.PI) / 180);
}

/** Position and uncertainty from one observation. Inputs must already be validated (schemas.ts). */
export function observationToPosition(obs: Observation): ObservedPosition {
  switch (obs.method) {
    case "gnss": {
      const accuracy = obs.accuracyM ?? GNSS_HORIZONTAL_95_M;
      const offset = obs.offsetM ?? GNSS_ALONGSIDE_OFFSET_95_M;
      const cov = addCov(covFromRadius95(accuracy), covFromRadius95(offset));
      return {
        method: "gnss",
        lat: obs.lat,
        lon: obs.lon,
        uncertaintyM: radius95(cov),
        covariance: cov,
        figures: { gnssError95M: accuracy, alongsideOffset95M: offset },
      };
    }
    case "radar": {
      const own = ownCov(obs.ownAccuracyM);
      const rangeM = obs.rangeNm * METRES_PER_NAUTICAL_MILE;
      const bearingTrueDeg =
        obs.bearingRef === "relative" ? normaliseBearing(obs.bearingDeg + (obs.headingTrueDeg ?? 0)) : normaliseBearing(obs.bearingDeg);
      const bearingError =
        obs.bearingRef === "relative" ? Math.hypot(RADAR_BEARING_ERROR_DEG, HEADING_ERROR_95_DEG) : RADAR_BEARING_ERROR_DEG;
      const rangeError = radarRangeError95M(obs.rangeScaleNm);
      const cross = crossRange(rangeM, bearingError);
      const cov = addCov(own.cov, covAlongCross(bearingTrueDeg, rangeError, cross));
      const p = direct(obs.ownLat, obs.ownLon, bearingTrueDeg, rangeM);
      return {
        method: "radar",
        lat: p.lat,
        lon: p.lon,
        uncertaintyM: radius95(cov),
        covariance: cov,
        figures: {
          rangeM,
          bearingTrueDeg,
          rangeScaleNm: obs.rangeScaleNm,
          rangeError95M: rangeError,
          bearingError95Deg: bearingError,
          crossRangeError95M: cross,
          ownPositionError95M: own.r95,
        },
      };
    }
    case "compass": {
      const own = ownCov(obs.ownAccuracyM);
      const d = magneticDeclination(obs.ownLat, obs.ownLon, obs.observedAt, 0);
      const bearingTrueDeg = magneticToTrue(obs.bearingMagneticDeg, d.declinationDeg);
      const bearingError = Math.hypot(HAND_COMPASS_ERROR_95_DEG, DECLINATION_ERROR_95_DEG);
      const distanceError = obs.distanceUncertaintyM ?? ESTIMATED_DISTANCE_FRACTION_95 * obs.distanceM;
      const cross = crossRange(obs.distanceM, bearingError);
      const cov = addCov(own.cov, covAlongCross(bearingTrueDeg, distanceError, cross));
      const p = direct(obs.ownLat, obs.ownLon, bearingTrueDeg, obs.distanceM);
      return {
        method: "compass",
        lat: p.lat,
        lon: p.lon,
        uncertaintyM: radius95(cov),
        covariance: cov,
        declinationDeg: d.declinationDeg,
        figures: {
          magneticModel: d.model,
          declinationDeg: d.declinationDeg,
          bearingMagneticDeg: obs.bearingMagneticDeg,
          bearingTrueDeg,
          distanceM: obs.distanceM,
          distanceError95M: distanceError,
          bearingError95Deg: bearingError,
          crossRangeError95M: cross,
          ownPositionError95M: own.r95,
        },
      };
    }
  }
}
