// The report map on the shared MapView: the aids (click one to choose it) and the assessment
// diagram — the swing circle around the charted position, each observed position with its 95%
// uncertainty circle, and the combined estimate. Server-safe (MapView loads OpenLayers lazily).
import { MapView, type Basemap, type MapFeature, type MapLayer } from "~/components/map/MapView";

export type MapAid = { id: number; code: string; lat: number; lon: number; category: string | null; aidType?: string | null; status: string };
export type MapDiagram = {
  charted: { lat: number; lon: number };
  swingRadiusM: number;
  observations: { lat: number; lon: number; uncertaintyM: number; consistent?: boolean; label?: string }[];
  estimate?: { lat: number; lon: number; uncertaintyM: number } | null;
};

const pt = (lat: number, lon: number) => ({ type: "Point" as const, coordinates: [lon, lat] as [number, number] });

export function ReportMap(props: { aids: MapAid[]; selectedAidId: number | null; onSelectAid?: (id: number) => void; basemap: unknown; diagram: MapDiagram | null; ariaLabel: string; height?: string }) {
  const aids: MapFeature[] = props.aids.map((a) => ({
    type: "Feature",
    id: `aid-${a.id}`,
    geometry: pt(a.lat, a.lon),
    properties: { symbol: "aid", ialaCategory: a.category, aidType: a.aidType ?? "buoy", status: a.status, label: a.id === props.selectedAidId ? `▶ ${a.code}` : a.code, aidId: a.id },
  }));
  const d = props.diagram;
  const diagram: MapFeature[] = d
    ? [
        { type: "Feature", geometry: pt(d.charted.lat, d.charted.lon), properties: { symbol: "circle", radiusM: Math.max(d.swingRadiusM, 0.5), label: "" } },
        ...d.observations.flatMap((o, i): MapFeature[] => [
          { type: "Feature", geometry: pt(o.lat, o.lon), properties: { symbol: "uncertainty", radiusM: o.uncertaintyM } },
          { type: "Feature", geometry: pt(o.lat, o.lon), properties: { symbol: "observed", label: o.label ?? (d.observations.length > 1 ? `${i + 1}${o.consistent === false ? " (outlier)" : ""}` : "observed") } },
        ]),
        ...(d.estimate && d.observations.length > 1
          ? [
              { type: "Feature", geometry: pt(d.estimate.lat, d.estimate.lon), properties: { symbol: "uncertainty", radiusM: d.estimate.uncertaintyM } } as MapFeature,
              { type: "Feature", geometry: pt(d.estimate.lat, d.estimate.lon), properties: { symbol: "observed", label: "estimate" } } as MapFeature,
            ]
          : []),
      ]
    : [];
  const layers: MapLayer[] = [
    { id: "diagram", features: diagram },
    { id: "aids", features: aids },
  ];
  const fitKey = d ? `${d.charted.lat},${d.charted.lon},${d.observations.map((o) => `${o.lat.toFixed(6)},${o.lon.toFixed(6)},${Math.round(o.uncertaintyM)}`).join(";")}` : "aids";
  // Fit the diagram (charted, swing circle, observations and their circles) when there is one,
  // else all the aids.
  const pts: { lat: number; lon: number; r: number }[] = d
    ? [{ ...d.charted, r: d.swingRadiusM }, ...d.observations.map((o) => ({ lat: o.lat, lon: o.lon, r: o.uncertaintyM }))]
    : props.aids.map((a) => ({ lat: a.lat, lon: a.lon, r: 300 }));
  const mPerDegLat = 111_320;
  const box = pts.length
    ? pts.reduce(
        (b, p) => {
          const dLat = (p.r * 1.3) / mPerDegLat;
          const dLon = (p.r * 1.3) / (mPerDegLat * Math.cos((p.lat * Math.PI) / 180));
          return [Math.min(b[0], p.lon - dLon), Math.min(b[1], p.lat - dLat), Math.max(b[2], p.lon + dLon), Math.max(b[3], p.lat + dLat)] as [number, number, number, number];
        },
        [Infinity, Infinity, -Infinity, -Infinity] as [number, number, number, number],
      )
    : null;
  return (
    <MapView
      ariaLabel={props.ariaLabel}
      basemap={props.basemap as Basemap}
      layers={layers}
      fit={box ?? "layers"}
      fitKey={fitKey}
      height={props.height ?? "20rem"}
      onFeatureClick={(p) => {
        if (typeof p.aidId === "number") props.onSelectAid?.(p.aidId);
      }}
    />
  );
}
