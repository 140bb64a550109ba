// Areas of interest: the whole harbour, a circle (centre + radius in nautical miles) or a
// polygon. Parsed from typed positions (the map writes the same text), checked, and turned
// into the prefilter geometry stored for the SPATIAL index.
import kinks from "@turf/kinks";
import { direct, METRES_PER_NAUTICAL_MILE } from "../geo/geodesy";
import { formatPosition, parsePosition } from "../geo/positions";

export type AreaKind = "harbour" | "circle" | "polygon";
export type LonLat = [number, number];

export type SubscriptionArea =
  | { kind: "harbour" }
  | { kind: "circle"; centre: { lat: number; lon: number }; radiusNm: number }
  | { kind: "polygon"; ring: LonLat[] /* closed, [lon, lat] */ };

export const MIN_RADIUS_NM = 0.05;
export const MAX_RADIUS_NM = 25;
export const MAX_POLYGON_VERTICES = 100;

export class AreaError extends Error {
  constructor(
    message: string,
    readonly field: "centre" | "radiusNm" | "polygon" | "areaKind",
  ) {
    super(message);
  }
}

export function parseCircle(centreText: string, radiusText: string): SubscriptionArea {
  const c = parsePosition(centreText ?? "");
  if (!c.ok) throw new AreaError(`Centre: ${c.error}`, "centre");
  const radiusNm = Number(String(radiusText ?? "").trim().replace(",", "."));
  if (!String(radiusText ?? "").trim() || !Number.isFinite(radiusNm)) throw new AreaError("Enter the radius in nautical miles, e.g. 1.5.", "radiusNm");
  if (radiusNm < MIN_RADIUS_NM || radiusNm > MAX_RADIUS_NM) throw new AreaError(`The radius must be between ${MIN_RADIUS_NM} and ${MAX_RADIUS_NM} M.`, "radiusNm");
  return { kind: "circle", centre: { lat: c.lat, lon: c.lon }, radiusNm };
}

/** One position per line (or separated by `|`); the ring is closed for you. */
export function parsePolygon(text: string): SubscriptionArea {
  const lines = String(text ?? "")
    .split(/\r?\n|\|/)
    .map((l) => l.trim())
    .filter(Boolean);
  if (lines.length > MAX_POLYGON_VERTICES + 1) throw new AreaError(`A polygon has at most ${MAX_POLYGON_VERTICES} corners.`, "polygon");
  const pts: LonLat[] = [];
  lines.forEach((line, i) => {
    const p = parsePosition(line);
    if (!p.ok) throw new AreaError(`Corner ${i + 1} (“${line.slice(0, 40)}”): ${p.error}`, "polygon");
    pts.push([p.lon, p.lat]);
  });
  const same = (a: LonLat, b: LonLat) => Math.abs(a[0] - b[0]) < 1e-9 && Math.abs(a[1] - b[1]) < 1e-9;
  if (pts.length > 1 && same(pts[0], pts[pts.length - 1])) pts.pop();
  for (let i = 1; i < pts.length; i++) {
    if (same(pts[i], pts[i - 1])) throw new AreaError(`Corners ${i} and ${i + 1} are the same position.`, "polygon");
  }
  if (pts.length < 3) throw new AreaError("A polygon needs at least three corners, one position per line.", "polygon");
  const ring = [...pts, pts[0]];
  const crossings = kinks({ type: "Feature", properties: {}, geometry: { type: "Polygon", coordinates: [ring] } });
  if (crossings.features.length > 0) {
    const [lon, lat] = crossings.features[0].geometry.coordinates;
    throw new AreaError(`The polygon's edges cross each other near ${formatPosition(lat, lon, "ddm", { decimals: 2 })}. List the corners in order around the area.`, "polygon");
  }
  if (Math.abs(signedArea(ring)) < 1e-12) throw new AreaError("The corners lie on one line: the polygon has no area.", "polygon");
  return { kind: "polygon", ring };
}

export function parseArea(input: { areaKind?: string; centre?: string; radiusNm?: string; polygon?: string }): SubscriptionArea {
  switch (input.areaKind) {
    case "harbour":
      return { kind: "harbour" };
    case "circle":
      return parseCircle(input.centre ?? "", input.radiusNm ?? "");
    case "polygon":
      return parsePolygon(input.polygon ?? "");
    default:
      throw new AreaError("Choose the area: the whole harbour, a circle or a polygon.", "areaKind");
  }
}

function signedArea(ring: LonLat[]): number {
  let s = 0;
  for (let i = 0; i + 1 < ring.length; i++) s += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  return s / 2;
}

/**
 * A polygon that contains the circle (vertices at r / cos(π/n), so every edge lies outside the
 * circle): the prefilter geometry for the SPATIAL index. The exact test is geodesic.
 */
export function circlePrefilterRing(centre: { lat: number; lon: number }, radiusNm: number, n = 32): LonLat[] {
  const rM = (radiusNm * METRES_PER_NAUTICAL_MILE) / Math.cos(Math.PI / n);
  const ring: LonLat[] = [];
  for (let i = 0; i < n; i++) {
    const p = direct(centre.lat, centre.lon, (360 * i) / n, rM);
    ring.push([p.lon, p.lat]);
  }
  ring.push(ring[0]);
  return ring;
}

/** GeoJSON for the stored `area` column (prefilter geometry); harbour areas use its boundary. */
export function prefilterGeometry(area: SubscriptionArea, harbourBoundary: unknown): unknown {
  if (area.kind === "harbour") return harbourBoundary;
  if (area.kind === "circle") return { type: "Polygon", coordinates: [circlePrefilterRing(area.centre, area.radiusNm)] };
  return { type: "Polygon", coordinates: [area.ring] };
}

/** Text to refill the form: the centre or the corners as mariners write them. */
export function areaText(area: SubscriptionArea): string | null {
  if (area.kind === "circle") return formatPosition(area.centre.lat, area.centre.lon, "ddm", { decimals: 2 });
  if (area.kind === "polygon") return area.ring.slice(0, -1).map(([lon, lat]) => formatPosition(lat, lon, "ddm", { decimals: 2 })).join("\n");
  return null;
}

export function describeArea(area: SubscriptionArea, harbourName = "the harbour"): string {
  if (area.kind === "harbour") return `all of ${harbourName}`;
  if (area.kind === "circle") return `${area.radiusNm} M around ${formatPosition(area.centre.lat, area.centre.lon, "ddm", { decimals: 2 })}`;
  return `a polygon of ${area.ring.length - 1} corners`;
}
