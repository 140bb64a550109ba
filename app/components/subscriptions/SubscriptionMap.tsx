// The area of interest on the map: shows what the typed fields describe, and drawing a circle
// or a polygon fills those fields (the form itself works without the map and without JS).
import { useMemo, useState } from "react";
import { MapView, type Basemap, type DrawMode, type DrawnShape, type MapFeature } from "~/components/map/MapView";
import { formatPosition, parsePosition } from "~/lib/geo/positions";

export type AreaFields = { areaKind: string; centre: string; radiusNm: string; polygon: string };

const ddm = (lat: number, lon: number) => formatPosition(lat, lon, "ddm", { decimals: 2 });

function featuresOf(f: AreaFields): MapFeature[] {
  if (f.areaKind === "circle") {
    const c = parsePosition(f.centre);
    const r = Number(f.radiusNm.replace(",", "."));
    if (!c.ok || !(r > 0)) return [];
    return [{ type: "Feature", geometry: { type: "Point", coordinates: [c.lon, c.lat] }, properties: { symbol: "circle", radiusM: r * 1852, label: `${r} M` } }];
  }
  if (f.areaKind === "polygon") {
    const pts = f.polygon
      .split(/\r?\n/)
      .map((l) => parsePosition(l.trim()))
      .flatMap((p) => (p.ok ? [[p.lon, p.lat] as [number, number]] : []));
    if (pts.length < 3) return [];
    return [{ type: "Feature", geometry: { type: "Polygon", coordinates: [[...pts, pts[0]]] }, properties: { symbol: "area", label: "Your area" } }];
  }
  return [];
}

export function SubscriptionMap({ fields, onChange, basemap, tileUrl }: { fields: AreaFields; onChange: (f: Partial<AreaFields>) => void; basemap: Basemap; tileUrl?: string | null }) {
  const [mode, setMode] = useState<DrawMode | null>(null);
  const layers = useMemo(() => [{ id: "area", features: featuresOf(fields) }], [fields]);
  const onDrawEnd = (shape: DrawnShape) => {
    setMode(null);
    if (shape.type === "Circle") {
      const [lon, lat] = shape.centre;
      onChange({ areaKind: "circle", centre: ddm(lat, lon), radiusNm: String(Math.max(0.05, Math.round((shape.radiusM / 1852) * 100) / 100)) });
    } else if (shape.type === "Polygon") {
      const ring = shape.coordinates[0].slice(0, -1);
      onChange({ areaKind: "polygon", polygon: ring.map(([lon, lat]) => ddm(lat, lon)).join("\n") });
    }
  };
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn-secondary" aria-pressed={mode === "Circle"} onClick={() => setMode(mode === "Circle" ? null : "Circle")}>
          Draw a circle
        </button>
        <button type="button" className="btn-secondary" aria-pressed={mode === "Polygon"} onClick={() => setMode(mode === "Polygon" ? null : "Polygon")}>
          Draw a polygon
        </button>
        {mode ? <span className="self-center text-sm">{mode === "Circle" ? "Click the centre, then drag out the radius." : "Click each corner; double-click the last one."}</span> : null}
      </div>
      <MapView
        ariaLabel="Map of your area of interest; the same area is written in the position fields above."
        basemap={basemap}
        tileUrl={tileUrl}
        layers={layers}
        fit={layers[0].features.length ? "layers" : undefined}
        fitLayerId="area"
        fitKey={fields.areaKind}
        draw={{ mode, onDrawEnd }}
        height="22rem"
      />
    </div>
  );
}
