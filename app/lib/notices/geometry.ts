/**
 * Notice geometry from typed positions: parse one position per line in a stated CRS, convert
 * to WGS 84, check the shape (polygon ≥ 3 points and not crossing itself, line ≥ 2 points,
 * circle radius > 0) and build GeoJSON geometry per RFC 7946 (lon/lat order; exterior rings
 * counter-clockwise, the right-hand rule of §3.1.6).
 */
import kinks from "@turf/kinks";
import { resolveCrs, toWgs84 } from "../geo/crs";
import { isGeoInputError } from "../geo/errors";
import { direct } from "../geo/geodesy";
import { parsePosition, parseProjectedPair } from "../geo/positions";
import type { PartKind } from "./vocabulary";

export type LonLat = [number, number];

export type LineResult =
  | { line: number; text: string; ok: true; lat: number; lon: number }
  | { line: number; text: string; ok: false; error: string };

export type PointGeometry = { type: "Point"; coordinates: LonLat };
export type LineGeometry = { type: "LineString"; coordinates: LonLat[] };
export type PolygonGeometry = { type: "Polygon"; coordinates: LonLat[][] };
export type PartGeometry = PointGeometry | LineGeometry | PolygonGeometry;

/** Max positions in one part; a local warning area rarely needs more than a dozen. */
export const MAX_POSITIONS_PER_PART = 200;
export const MAX_RADIUS_NM = 50;
/** Vertices of the polygon that stands in for a circle in storage and in GeoJSON. */
export const CIRCLE_VERTICES = 72;
const METRES_PER_NM = 1852; // International nautical mile, 1929 (see TRADE.md)

/** Non-empty lines of the positions text with their 1-based line numbers. */
export function positionLines(text: string): { line: number; text: string }[] {
  return text
    .split(/\r?\n/)
    .map((t, i) => ({ line: i + 1, text: t.trim() }))
    .filter((l) => l.text !== "");
}

/** Parse each line in `crs` and convert it to WGS 84; each line reports its own result. */
export function parsePositionLines(text: string, crs: string): LineResult[] {
  let kind: "geographic" | "projected";
  try {
    kind = resolveCrs(crs).kind;
  } catch (e) {
    const msg = isGeoInputError(e) ? e.message : "Unknown coordinate reference system";
    return positionLines(text).map((l) => ({ ...l, ok: false as const, error: msg }));
  }
  return positionLines(text).map((l) => {
    try {
      if (kind === "projected") {
        const p = parseProjectedPair(l.text);
        if (!p.ok) return { ...l, ok: false as const, error: p.error };
        const g = toWgs84(crs, { easting: p.easting, northing: p.northing });
        return { ...l, ok: true as const, lat: g.lat, lon: g.lon };
      }
      const p = parsePosition(l.text);
      if (!p.ok) return { ...l, ok: false as const, error: p.error };
      const g = toWgs84(crs, { lat: p.lat, lon: p.lon });
      return { ...l, ok: true as const, lat: g.lat, lon: g.lon };
    } catch (e) {
      return { ...l, ok: false as const, error: isGeoInputError(e) ? e.message : "This position cannot be converted" };
    }
  });
}

/** Twice the signed planar area of a ring in lon/lat: > 0 counter-clockwise. */
export function ringSignedArea2(ring: LonLat[]): number {
  let s = 0;
  for (let i = 0; i < ring.length; i++) {
    const [x1, y1] = ring[i]!;
    const [x2, y2] = ring[(i + 1) % ring.length]!;
    s += x1 * y2 - x2 * y1;
  }
  return s;
}

function samePoint(a: LonLat, b: LonLat): boolean {
  return Math.abs(a[0] - b[0]) < 1e-12 && Math.abs(a[1] - b[1]) < 1e-12;
}

/** A closed ring (first = last), counter-clockwise (RFC 7946 §3.1.6 right-hand rule). */
export function closedCcwRing(points: LonLat[]): LonLat[] {
  const open = points.length > 1 && samePoint(points[0]!, points[points.length - 1]!) ? points.slice(0, -1) : [...points];
  const ccw = ringSignedArea2(open) < 0 ? [...open].reverse() : open;
  return [...ccw, ccw[0]!];
}

/** A geodesic circle as a closed counter-clockwise polygon ring. */
export function circleRing(centre: LonLat, radiusNm: number, vertices = CIRCLE_VERTICES): LonLat[] {
  const ring: LonLat[] = [];
  for (let i = 0; i < vertices; i++) {
    // Decreasing bearing walks counter-clockwise seen from above.
    const bearing = (360 - (i * 360) / vertices) % 360;
    const p = direct(centre[1], centre[0], bearing, radiusNm * METRES_PER_NM);
    ring.push([round7(p.lon), round7(p.lat)]);
  }
  ring.push(ring[0]!);
  return ring;
}

function round7(v: number): number {
  return Math.round(v * 1e7) / 1e7;
}

export type PartCheck =
  | { ok: true; coordinates: LonLat[]; geometry: PartGeometry }
  | { ok: false; error: string; field: "positions" | "radiusNm" };

/**
 * Check a part's shape and build its WGS 84 geometry. `coordinates` are the entered positions
 * in WGS 84 (in entered order); for a circle, the one centre.
 */
export function buildPartGeometry(kind: PartKind, coordinates: LonLat[], radiusNm?: number | null): PartCheck {
  const n = coordinates.length;
  if (n === 0) return { ok: false, field: "positions", error: "Enter at least one position" };
  if (n > MAX_POSITIONS_PER_PART) return { ok: false, field: "positions", error: `At most ${MAX_POSITIONS_PER_PART} positions in one part` };
  switch (kind) {
    case "point":
      if (n !== 1) return { ok: false, field: "positions", error: `A point has exactly one position (${n} given); use a line or an area for more` };
      return { ok: true, coordinates, geometry: { type: "Point", coordinates: coordinates[0]! } };
    case "circle":
      if (n !== 1) return { ok: false, field: "positions", error: `A circle has one centre position (${n} given)` };
      if (radiusNm == null || !Number.isFinite(radiusNm) || radiusNm <= 0) {
        return { ok: false, field: "radiusNm", error: "A circle needs a radius greater than 0 nautical miles" };
      }
      if (radiusNm > MAX_RADIUS_NM) return { ok: false, field: "radiusNm", error: `A radius of at most ${MAX_RADIUS_NM} M` };
      return { ok: true, coordinates, geometry: { type: "Polygon", coordinates: [circleRing(coordinates[0]!, radiusNm)] } };
    case "line": {
      if (n < 2) return { ok: false, field: "positions", error: "A line needs at least two positions" };
      for (let i = 1; i < n; i++) {
        if (samePoint(coordinates[i - 1]!, coordinates[i]!)) return { ok: false, field: "positions", error: `Positions ${i} and ${i + 1} of the line are the same` };
      }
      return { ok: true, coordinates, geometry: { type: "LineString", coordinates } };
    }
    case "area": {
      const open = n > 1 && samePoint(coordinates[0]!, coordinates[n - 1]!) ? coordinates.slice(0, -1) : coordinates;
      if (open.length < 3) return { ok: false, field: "positions", error: "An area needs at least three different positions" };
      for (let i = 0; i < open.length; i++) {
        for (let j = i + 1; j < open.length; j++) {
          if (samePoint(open[i]!, open[j]!)) return { ok: false, field: "positions", error: `Positions ${i + 1} and ${j + 1} of the area are the same` };
        }
      }
      const crossings = kinks({ type: "Polygon", coordinates: [[...open, open[0]!]] });
      if (crossings.features.length > 0) {
        const [x, y] = crossings.features[0]!.geometry.coordinates as LonLat;
        return {
          ok: false,
          field: "positions",
          error: `The area's edges cross each other (near ${y.toFixed(4)}°, ${x.toFixed(4)}°): list the corners in order around the area`,
        };
      }
      if (Math.abs(ringSignedArea2(open)) < 1e-14) return { ok: false, field: "positions", error: "The positions of the area lie on one line" };
      return { ok: true, coordinates: open, geometry: { type: "Polygon", coordinates: [closedCcwRing(open)] } };
    }
  }
}

/** WKT for MariaDB's ST_GeomFromText(?, 4326): X = longitude, Y = latitude. */
export function toWkt(g: PartGeometry): string {
  const pt = (c: LonLat) => `${c[0]} ${c[1]}`;
  if (g.type === "Point") return `POINT(${pt(g.coordinates)})`;
  if (g.type === "LineString") return `LINESTRING(${g.coordinates.map(pt).join(",")})`;
  return `POLYGON(${g.coordinates.map((r) => `(${r.map(pt).join(",")})`).join(",")})`;
}

export function bboxOf(coords: LonLat[]): [number, number, number, number] {
  let [minX, minY, maxX, maxY] = [Infinity, Infinity, -Infinity, -Infinity];
  for (const [x, y] of coords) {
    minX = Math.min(minX, x);
    minY = Math.min(minY, y);
    maxX = Math.max(maxX, x);
    maxY = Math.max(maxY, y);
  }
  return [minX, minY, maxX, maxY];
}

export function geometryCoords(g: PartGeometry): LonLat[] {
  if (g.type === "Point") return [g.coordinates];
  if (g.type === "LineString") return g.coordinates;
  return g.coordinates.flat();
}

/**
 * Area vertices in the order of the MSI manual: clockwise, starting at the north-west corner
 * (joint IMO/IHO/WMO Manual on Maritime Safety Information, see TRADE.md).
 */
export function msiVertexOrder(points: LonLat[]): LonLat[] {
  if (points.length < 3) return points;
  const cw = ringSignedArea2(points) > 0 ? [...points].reverse() : [...points];
  const meanLat = cw.reduce((s, p) => s + p[1], 0) / cw.length;
  const k = Math.cos((meanLat * Math.PI) / 180);
  let best = 0;
  for (let i = 1; i < cw.length; i++) {
    // North-west-most: furthest along the direction 315° (north minus east, east scaled).
    if (cw[i]![1] - cw[i]![0] * k > cw[best]![1] - cw[best]![0] * k) best = i;
  }
  return [...cw.slice(best), ...cw.slice(0, best)];
}
