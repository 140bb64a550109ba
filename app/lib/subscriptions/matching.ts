// Exact matching of a notice against a subscription's area and types, after the SPATIAL-index
// prefilter (MBRIntersects) in the database. Circles are tested geodesically: the distance from
// the circle's centre to the notice's geometry on the WGS 84 ellipsoid (app/lib/geo/geodesy.ts).
// Polygons are tested with @turf/boolean-intersects (planar in lon/lat, like the charts' own
// straight edges at harbour scale).
import booleanIntersects from "@turf/boolean-intersects";
import { inverse, METRES_PER_NAUTICAL_MILE, toLocalEN } from "../geo/geodesy";
import type { LonLat, SubscriptionArea } from "./area";

export type NoticePartShape = { kind: "point" | "line" | "area" | "circle"; coordinates: LonLat[]; radiusNm: number | null };
export type NoticeShape = { id: number; harbourId: number; generalType: string; parts: NoticePartShape[] };
export type SubscriptionShape = { harbourId: number; area: SubscriptionArea; generalTypes: string[] };

export type BBox = [minLon: number, minLat: number, maxLon: number, maxLat: number];

const DEG_PER_NM_LAT = 1 / 59; // a little more than 1′ per M: the bbox must not be too small

export function bboxOfPoints(points: LonLat[], padNm = 0): BBox {
  let [minLon, minLat, maxLon, maxLat] = [Infinity, Infinity, -Infinity, -Infinity];
  for (const [lon, lat] of points) {
    if (lon < minLon) minLon = lon;
    if (lon > maxLon) maxLon = lon;
    if (lat < minLat) minLat = lat;
    if (lat > maxLat) maxLat = lat;
  }
  if (padNm > 0) {
    const dLat = padNm * DEG_PER_NM_LAT;
    const dLon = dLat / Math.max(0.01, Math.cos((Math.max(Math.abs(minLat), Math.abs(maxLat)) * Math.PI) / 180));
    return [minLon - dLon, minLat - dLat, maxLon + dLon, maxLat + dLat];
  }
  return [minLon, minLat, maxLon, maxLat];
}

export function bboxesIntersect(a: BBox, b: BBox): boolean {
  return a[0] <= b[2] && b[0] <= a[2] && a[1] <= b[3] && b[1] <= a[3];
}

export function noticeBBox(n: NoticeShape): BBox {
  const boxes = n.parts.map((p) => bboxOfPoints(p.coordinates, p.kind === "circle" ? (p.radiusNm ?? 0) : 0));
  return boxes.reduce((a, b) => [Math.min(a[0], b[0]), Math.min(a[1], b[1]), Math.max(a[2], b[2]), Math.max(a[3], b[3])], [Infinity, Infinity, -Infinity, -Infinity] as BBox);
}

export function areaBBox(area: SubscriptionArea): BBox | null {
  if (area.kind === "harbour") return null; // the whole harbour: matched by harbour id
  if (area.kind === "circle") return bboxOfPoints([[area.centre.lon, area.centre.lat]], area.radiusNm);
  return bboxOfPoints(area.ring);
}

function geometryOf(part: NoticePartShape): { type: "Point" | "LineString" | "Polygon"; coordinates: unknown } {
  if (part.kind === "point" || part.kind === "circle") return { type: "Point", coordinates: part.coordinates[0] };
  if (part.kind === "line") return { type: "LineString", coordinates: part.coordinates };
  const ring = part.coordinates;
  const closed = ring.length > 0 && ring[0][0] === ring[ring.length - 1][0] && ring[0][1] === ring[ring.length - 1][1];
  return { type: "Polygon", coordinates: [closed ? ring : [...ring, ring[0]]] };
}

const feature = (geometry: unknown) => ({ type: "Feature" as const, properties: {}, geometry }) as never;

/**
 * Geodesic distance (m) from `centre` to the polyline through `points` (closed when `ring`).
 * Each vertex goes into the azimuthal equidistant plane about the centre, where distances from
 * the centre are exact; the closest point of each edge is found in that plane. At harbour scale
 * (a few M) the difference between the edge in that plane and the true geodesic edge is
 * centimetres.
 */
export function distanceToPathM(centre: { lat: number; lon: number }, points: LonLat[], ring: boolean): number {
  const en = points.map(([lon, lat]) => toLocalEN(centre.lat, centre.lon, lat, lon));
  if (en.length === 1) return Math.hypot(en[0].e, en[0].n);
  let best = Infinity;
  const last = ring ? en.length : en.length - 1;
  for (let i = 0; i < last; i++) {
    const a = en[i];
    const b = en[(i + 1) % en.length];
    const dx = b.e - a.e;
    const dy = b.n - a.n;
    const len2 = dx * dx + dy * dy;
    const t = len2 === 0 ? 0 : Math.max(0, Math.min(1, -(a.e * dx + a.n * dy) / len2));
    const d = Math.hypot(a.e + t * dx, a.n + t * dy);
    if (d < best) best = d;
  }
  return best;
}

/** Even-odd ray casting in lon/lat (boundary counts as inside only by the distance test after). */
export function pointInRing(lon: number, lat: number, ring: LonLat[]): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [xi, yi] = ring[i];
    const [xj, yj] = ring[j];
    if (yi > lat !== yj > lat && lon < ((xj - xi) * (lat - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

/** Distance in metres from a point to a notice part (0 when inside an area or circle). */
export function distanceToPartM(centre: { lat: number; lon: number }, part: NoticePartShape): number {
  switch (part.kind) {
    case "point":
      return inverse(centre.lat, centre.lon, part.coordinates[0][1], part.coordinates[0][0]).distanceM;
    case "circle": {
      const d = inverse(centre.lat, centre.lon, part.coordinates[0][1], part.coordinates[0][0]).distanceM;
      return Math.max(0, d - (part.radiusNm ?? 0) * METRES_PER_NAUTICAL_MILE);
    }
    case "line":
      return distanceToPathM(centre, part.coordinates, false);
    case "area": {
      const g = geometryOf(part);
      const ring = (g.coordinates as LonLat[][])[0];
      if (pointInRing(centre.lon, centre.lat, ring)) return 0;
      return distanceToPathM(centre, ring.slice(0, -1), true);
    }
  }
}

export function areaTouchesPart(area: SubscriptionArea, part: NoticePartShape): boolean {
  if (part.coordinates.length === 0) return false;
  if (area.kind === "harbour") return true;
  if (area.kind === "circle") return distanceToPartM(area.centre, part) <= area.radiusNm * METRES_PER_NAUTICAL_MILE;
  // Polygon subscription.
  if (part.kind === "circle") {
    const [lon, lat] = part.coordinates[0];
    if (pointInRing(lon, lat, area.ring)) return true;
    return distanceToPathM({ lat, lon }, area.ring.slice(0, -1), true) <= (part.radiusNm ?? 0) * METRES_PER_NAUTICAL_MILE;
  }
  if (part.kind === "point") return pointInRing(part.coordinates[0][0], part.coordinates[0][1], area.ring);
  return booleanIntersects(feature({ type: "Polygon", coordinates: [area.ring] }), feature(geometryOf(part)));
}

export function typeWanted(generalTypes: string[], generalType: string): boolean {
  return generalTypes.length === 0 || generalTypes.includes(generalType);
}

/** Does this notice concern this subscription? (types, harbour, then the exact area test). */
export function subscriptionMatchesNotice(sub: SubscriptionShape, notice: NoticeShape): boolean {
  if (sub.harbourId !== notice.harbourId) return false;
  if (!typeWanted(sub.generalTypes, notice.generalType)) return false;
  if (sub.area.kind === "harbour") return true;
  return notice.parts.some((p) => areaTouchesPart(sub.area, p));
}
