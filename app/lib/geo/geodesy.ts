/**
 * Geodesics on the WGS 84 ellipsoid (Karney's algorithms, via geographiclib-geodesic):
 * distances in metres, nautical miles and cables; bearings in degrees true, [0, 360).
 */
import GeographicLib from "geographiclib-geodesic";

/** 1 international nautical mile = 1852 m exactly (International Hydrographic Conference, Monaco, 1929; IHO, BIPM). */
export const METRES_PER_NAUTICAL_MILE = 1852;
/** 1 cable = 0.1 nautical mile (common practice). */
export const METRES_PER_CABLE = METRES_PER_NAUTICAL_MILE / 10;

const { Geodesic } = GeographicLib;
const WGS84 = Geodesic.WGS84;
const INVERSE_MASK = Geodesic.DISTANCE | Geodesic.AZIMUTH;
const DIRECT_MASK = Geodesic.LATITUDE | Geodesic.LONGITUDE | Geodesic.AZIMUTH;

export function metresToNauticalMiles(m: number): number {
  return m / METRES_PER_NAUTICAL_MILE;
}
export function nauticalMilesToMetres(nm: number): number {
  return nm * METRES_PER_NAUTICAL_MILE;
}
export function metresToCables(m: number): number {
  return m / METRES_PER_CABLE;
}
export function cablesToMetres(cables: number): number {
  return cables * METRES_PER_CABLE;
}

/** A bearing in [0, 360). (−0 and 360 become 0.) */
export function normaliseBearing(deg: number): number {
  let b = deg % 360;
  if (b < 0) b += 360;
  if (b >= 360 || Object.is(b, -0)) b = 0;
  return b;
}

export interface InverseResult {
  distanceM: number;
  distanceNm: number;
  distanceCables: number;
  /** Bearing true at the start point towards the end point. */
  initialBearingTrueDeg: number;
  /** Direction of travel (true) on arrival at the end point. */
  finalBearingTrueDeg: number;
}

/** Shortest distance and bearings between two WGS 84 positions (inverse geodesic problem). */
export function inverse(lat1: number, lon1: number, lat2: number, lon2: number): InverseResult {
  const r = WGS84.Inverse(lat1, lon1, lat2, lon2, INVERSE_MASK);
  const s = r.s12!;
  return {
    distanceM: s,
    distanceNm: s / METRES_PER_NAUTICAL_MILE,
    distanceCables: s / METRES_PER_CABLE,
    initialBearingTrueDeg: normaliseBearing(r.azi1!),
    finalBearingTrueDeg: normaliseBearing(r.azi2!),
  };
}

export interface DirectResult {
  lat: number;
  lon: number;
  /** Direction of travel (true) on arrival. */
  finalBearingTrueDeg: number;
}

/** Position reached from a start point along a bearing (true) for a distance (direct problem). */
export function direct(lat: number, lon: number, bearingTrueDeg: number, distanceM: number): DirectResult {
  const r = WGS84.Direct(lat, lon, bearingTrueDeg, distanceM, DIRECT_MASK);
  return { lat: r.lat2!, lon: r.lon2!, finalBearingTrueDeg: normaliseBearing(r.azi2!) };
}

/** Reverse azimuth at the end point (bearing from point 2 back towards point 1). */
export function reverseBearing(finalBearingTrueDeg: number): number {
  return normaliseBearing(finalBearingTrueDeg + 180);
}

/**
 * Local east/north offsets (metres) of `p` from `origin` (azimuthal equidistant about the origin:
 * exact distance and bearing from the origin). Used to combine nearby observations.
 */
export function toLocalEN(originLat: number, originLon: number, lat: number, lon: number): { e: number; n: number } {
  const r = WGS84.Inverse(originLat, originLon, lat, lon, INVERSE_MASK);
  const a = (r.azi1! * Math.PI) / 180;
  return { e: r.s12! * Math.sin(a), n: r.s12! * Math.cos(a) };
}

/** Inverse of toLocalEN. */
export function fromLocalEN(originLat: number, originLon: number, e: number, n: number): { lat: number; lon: number } {
  const s = Math.hypot(e, n);
  if (s === 0) return { lat: originLat, lon: originLon };
  const az = (Math.atan2(e, n) * 180) / Math.PI;
  const r = WGS84.Direct(originLat, originLon, az, s, Geodesic.LATITUDE | Geodesic.LONGITUDE);
  return { lat: r.lat2!, lon: r.lon2! };
}

/** A Geodesic on another ellipsoid (for checks against published examples on GRS 80 etc.). */
export function geodesicOn(a: number, f: number) {
  return new Geodesic.Geodesic(a, f);
}
