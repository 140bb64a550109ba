/**
 * MapView: Tidewire's reusable map (OpenLayers), server-safe. OpenLayers itself lives in
 * MapView.client.tsx and is loaded with React.lazy only after hydration, so no page ships it
 * in its first JavaScript (see ../shared/STACK.md).
 *
 * Props (all coordinates WGS 84, [longitude, latitude]):
 * - `ariaLabel` (required): what the map shows, for screen readers. Give the same information
 *   as text or a table elsewhere on the page; the map is a picture of it.
 * - `basemap`: the harbour's offline base map (GeoJSON FeatureCollection from
 *   harbours.basemap_geojson; features with properties.kind = land | basin | breakwater | shoal).
 *   A graticule is always drawn.
 * - `tileUrl`: optional XYZ tile URL template ({x} {y} {z}); pass env MAP_TILE_URL from a loader.
 * - `layers`: MapLayer[]; each `{ id, features }` with GeoJSON features whose
 *   `properties.symbol` picks the style:
 *     "aid"         Point; properties.ialaCategory, aidType, status, label → IALA-coloured symbol
 *     "notice"      any geometry; properties.urgency, status, label
 *     "circle"      Point centre; properties.radiusM → a geodesic circle (e.g. a swing circle)
 *     "uncertainty" Point; properties.radiusM → a dashed circle (e.g. an observation's 95 % circle)
 *     "observed"    Point → a cross-hair marker
 *     "draft"       any geometry → the editor's live geometry (dashed)
 *     "area"        Polygon → a plain area (e.g. a subscription area)
 *   Optional properties.label is drawn beside the feature; properties.href makes it clickable.
 * - `fit`: "layers" (default: fit everything in `layers`, else the base map) or a bbox
 *   [minLon, minLat, maxLon, maxLat]. The view is fitted once, and again when `fitKey` changes.
 *   `fitLayerId` fits to that one layer when it has features (e.g. the geometry being edited).
 * - `draw`: `{ mode: "Point" | "LineString" | "Polygon" | "Circle", onDrawEnd }` turns on
 *   drawing; onDrawEnd gets `{ type: "Point" | "LineString" | "Polygon", coordinates }` or
 *   `{ type: "Circle", centre, radiusM }` in WGS 84. `mode: null` turns drawing off.
 * - `onMoveEnd(bbox)`: called after each pan/zoom with the visible extent in WGS 84.
 * - `onFeatureClick(properties)`: called when a feature is clicked (default: follow properties.href).
 * - `height`: CSS height (default "24rem"); `className` for the frame.
 */
import { lazy, Suspense, useEffect, useRef, useState } from "react";

export type LonLat = [number, number];
export type Bbox = [number, number, number, number];
export type MapGeometry =
  | { type: "Point"; coordinates: LonLat }
  | { type: "LineString"; coordinates: LonLat[] }
  | { type: "Polygon"; coordinates: LonLat[][] }
  | { type: "GeometryCollection"; geometries: MapGeometry[] };
export type MapFeature = { type: "Feature"; id?: string | number; geometry: MapGeometry | null; properties: Record<string, unknown> & { symbol: string } };
export type MapLayer = { id: string; features: MapFeature[] };
export type DrawMode = "Point" | "LineString" | "Polygon" | "Circle";
export type DrawnShape = { type: "Point"; coordinates: LonLat } | { type: "LineString"; coordinates: LonLat[] } | { type: "Polygon"; coordinates: LonLat[][] } | { type: "Circle"; centre: LonLat; radiusM: number };
export type Basemap = { type: "FeatureCollection"; features: unknown[] } | null | undefined;

export type MapViewProps = {
  ariaLabel: string;
  basemap?: Basemap;
  tileUrl?: string | null;
  layers?: MapLayer[];
  fit?: "layers" | Bbox;
  fitKey?: string | number;
  fitLayerId?: string;
  draw?: { mode: DrawMode | null; onDrawEnd: (shape: DrawnShape) => void };
  onMoveEnd?: (bbox: Bbox) => void;
  onFeatureClick?: (properties: Record<string, unknown>) => void;
  height?: string;
  className?: string;
  /**
   * Load OpenLayers only when the map comes near the viewport (IntersectionObserver, 300 px
   * ahead), for pages where the map sits below the first screen on a phone and the text above it
   * is what the reader came for (the board). Default: load after hydration.
   */
  loadWhenVisible?: boolean;
};

const ClientMap = lazy(() => import("./MapView.client"));

function useHydrated(): boolean {
  const [hydrated, setHydrated] = useState(false);
  useEffect(() => setHydrated(true), []);
  return hydrated;
}

/** True once the element is within `marginPx` of the viewport (at once where there is no IntersectionObserver). */
function useNearViewport(ref: React.RefObject<HTMLElement | null>, enabled: boolean, marginPx = 300): boolean {
  const [near, setNear] = useState(!enabled);
  useEffect(() => {
    if (!enabled || near) return;
    const el = ref.current;
    if (!el || typeof IntersectionObserver === "undefined") {
      setNear(true);
      return;
    }
    const io = new IntersectionObserver((entries) => {
      if (entries.some((e) => e.isIntersecting)) setNear(true);
    }, { rootMargin: `${marginPx}px 0px` });
    io.observe(el);
    return () => io.disconnect();
  }, [enabled, near, ref, marginPx]);
  return near;
}

export function MapView(props: MapViewProps) {
  const hydrated = useHydrated();
  const frame = useRef<HTMLDivElement>(null);
  const near = useNearViewport(frame, Boolean(props.loadWhenVisible));
  const height = props.height ?? "24rem";
  // Without JavaScript the map never loads: say so instead of "Loading map…" (hidden by app.css
  // when scripting is off).
  const placeholder = (
    <div className="flex h-full items-center justify-center px-4 text-center text-sm text-slate" aria-hidden="true">
      <span className="map-loading">Loading map…</span>
      <noscript>The map needs JavaScript. What it shows is also given as text on this page.</noscript>
    </div>
  );
  return (
    <div
      role="region"
      aria-label={props.ariaLabel}
      className={`no-print-map relative overflow-hidden rounded-lg border border-mist bg-[#dcecf2] ${props.className ?? ""}`}
      style={{ height }}
      data-testid="map"
      ref={frame}
    >
      {hydrated && near ? (
        <Suspense fallback={placeholder}>
          <ClientMap {...props} />
        </Suspense>
      ) : (
        placeholder
      )}
    </div>
  );
}
