// The report map: the harbour's offline base map, the aids (our own symbols, click to choose
// one) and the assessment diagram: charted position, swing circle, observed position with its
// 95% uncertainty circle, and the combined estimate. Client-only: loaded with React.lazy so
// OpenLayers never reaches the server bundle or the route's preload.
import "ol/ol.css";
import { useEffect, useRef } from "react";
import OlMap from "ol/Map";
import View from "ol/View";
import Feature from "ol/Feature";
import GeoJSON from "ol/format/GeoJSON";
import LineString from "ol/geom/LineString";
import Point from "ol/geom/Point";
import { circular } from "ol/geom/Polygon";
import VectorLayer from "ol/layer/Vector";
import VectorSource from "ol/source/Vector";
import { fromLonLat } from "ol/proj";
import { createEmpty, extend, isEmpty } from "ol/extent";
import { Circle as CircleStyle, Fill, RegularShape, Stroke, Style, Text } from "ol/style";
import type { FeatureLike } from "ol/Feature";

export type DiagramAid = { id: number; code: string; lat: number; lon: number; category: string | null; status: string };
export type DiagramPreview = {
  charted: { lat: number; lon: number };
  swingRadiusM: number;
  observations: { lat: number; lon: number; uncertaintyM: number; consistent?: boolean }[];
  estimate?: { lat: number; lon: number; uncertaintyM: number } | null;
};

// Our own symbols: a filled disc in the mark's colour, ringed; cardinal marks half black.
function aidColour(category: string | null): { fill: string; stroke: string } {
  switch (category) {
    case "port":
    case "preferred_channel_starboard":
      return { fill: "#c62828", stroke: "#5c0f0f" };
    case "starboard":
    case "preferred_channel_port":
      return { fill: "#2e7d32", stroke: "#103d14" };
    case "north_cardinal":
    case "east_cardinal":
    case "south_cardinal":
    case "west_cardinal":
      return { fill: "#f2c300", stroke: "#111111" };
    case "isolated_danger":
      return { fill: "#111111", stroke: "#c62828" };
    case "safe_water":
      return { fill: "#ffffff", stroke: "#c62828" };
    case "special":
      return { fill: "#f2c300", stroke: "#7a6200" };
    case "emergency_wreck":
      return { fill: "#1f4fbf", stroke: "#f2c300" };
    default:
      return { fill: "#7b1fa2", stroke: "#2a0a38" };
  }
}

function aidStyle(f: FeatureLike, selected: boolean) {
  const c = aidColour(f.get("category"));
  return new Style({
    image: new CircleStyle({
      radius: selected ? 9 : 6,
      fill: new Fill({ color: c.fill }),
      stroke: new Stroke({ color: selected ? "#0b4f6c" : c.stroke, width: selected ? 4 : 2 }),
    }),
    text: new Text({
      text: f.get("code"),
      offsetY: -14,
      font: "600 11px system-ui, sans-serif",
      fill: new Fill({ color: "#0f2530" }),
      stroke: new Stroke({ color: "#ffffff", width: 3 }),
    }),
  });
}

const basemapStyle = (f: FeatureLike) => {
  const kind = f.get("kind");
  if (kind === "land") return new Style({ fill: new Fill({ color: "#efe6cf" }), stroke: new Stroke({ color: "#8a7a50", width: 1 }) });
  if (kind === "breakwater") return new Style({ stroke: new Stroke({ color: "#4a5a66", width: 3 }) });
  if (kind === "shoal") return new Style({ fill: new Fill({ color: "rgba(27,127,147,0.15)" }), stroke: new Stroke({ color: "#1b7f93", width: 1, lineDash: [4, 3] }) });
  return new Style({ fill: new Fill({ color: "rgba(207,233,238,0.6)" }), stroke: new Stroke({ color: "#1b7f93", width: 1 }) });
};

function circle(lat: number, lon: number, radiusM: number) {
  return circular([lon, lat], Math.max(radiusM, 0.5), 96).transform("EPSG:4326", "EPSG:3857");
}

export default function ReportDiagram(props: {
  aids: DiagramAid[];
  selectedAidId: number | null;
  onSelectAid?: (id: number) => void;
  basemap: unknown;
  preview: DiagramPreview | null;
  centre: { lat: number; lon: number };
  label?: string;
}) {
  const el = useRef<HTMLDivElement>(null);
  const map = useRef<OlMap | null>(null);
  const aidSource = useRef(new VectorSource());
  const diagramSource = useRef(new VectorSource());
  const selectedRef = useRef<number | null>(props.selectedAidId);
  const onSelect = useRef(props.onSelectAid);
  onSelect.current = props.onSelectAid;

  useEffect(() => {
    if (!el.current) return;
    const basemapSource = new VectorSource();
    try {
      if (props.basemap) basemapSource.addFeatures(new GeoJSON().readFeatures(props.basemap, { featureProjection: "EPSG:3857" }));
    } catch {
      /* no base map: the aids alone still orient the user */
    }
    const aidLayer = new VectorLayer({ source: aidSource.current, style: (f) => aidStyle(f, f.get("id") === selectedRef.current) });
    const m = new OlMap({
      target: el.current,
      layers: [
        new VectorLayer({ source: basemapSource, style: basemapStyle }),
        new VectorLayer({ source: diagramSource.current }),
        aidLayer,
      ],
      view: new View({ center: fromLonLat([props.centre.lon, props.centre.lat]), zoom: 12.5 }),
    });
    m.on("singleclick", (evt) => {
      m.forEachFeatureAtPixel(
        evt.pixel,
        (f) => {
          const id = f.get("id");
          if (typeof id === "number") {
            onSelect.current?.(id);
            return true;
          }
          return false;
        },
        { layerFilter: (l) => l === aidLayer, hitTolerance: 6 },
      );
    });
    m.on("pointermove", (evt) => {
      const hit = m.hasFeatureAtPixel(evt.pixel, { layerFilter: (l) => l === aidLayer, hitTolerance: 6 });
      const target = m.getTargetElement();
      if (target) target.style.cursor = hit ? "pointer" : "";
    });
    map.current = m;
    return () => {
      m.setTarget(undefined);
      map.current = null;
    };
    // The map is built once; later prop changes update its sources below.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  useEffect(() => {
    const src = aidSource.current;
    src.clear();
    src.addFeatures(
      props.aids.map((a) => {
        const f = new Feature({ geometry: new Point(fromLonLat([a.lon, a.lat])) });
        f.setProperties({ id: a.id, code: a.code, category: a.category });
        return f;
      }),
    );
  }, [props.aids]);

  useEffect(() => {
    selectedRef.current = props.selectedAidId;
    aidSource.current.changed();
  }, [props.selectedAidId]);

  useEffect(() => {
    const src = diagramSource.current;
    src.clear();
    const p = props.preview;
    if (!p) return;
    const swing = new Feature({ geometry: circle(p.charted.lat, p.charted.lon, p.swingRadiusM) });
    swing.setStyle(new Style({ fill: new Fill({ color: "rgba(45,106,58,0.12)" }), stroke: new Stroke({ color: "#2d6a3a", width: 2 }) }));
    const charted = new Feature({ geometry: new Point(fromLonLat([p.charted.lon, p.charted.lat])) });
    charted.setStyle(new Style({ image: new RegularShape({ points: 4, radius: 9, radius2: 0, angle: Math.PI / 4, stroke: new Stroke({ color: "#0f2530", width: 2 }) }) }));
    const features: Feature[] = [swing, charted];
    p.observations.forEach((o) => {
      const colour = o.consistent === false ? "#8a5a00" : "#b4410b";
      const u = new Feature({ geometry: circle(o.lat, o.lon, o.uncertaintyM) });
      u.setStyle(new Style({ fill: new Fill({ color: "rgba(180,65,11,0.08)" }), stroke: new Stroke({ color: colour, width: 2, lineDash: [6, 4] }) }));
      const pt = new Feature({ geometry: new Point(fromLonLat([o.lon, o.lat])) });
      pt.setStyle(new Style({ image: new CircleStyle({ radius: 5, fill: new Fill({ color: colour }), stroke: new Stroke({ color: "#fff", width: 1.5 }) }) }));
      const line = new Feature({ geometry: new LineString([fromLonLat([p.charted.lon, p.charted.lat]), fromLonLat([o.lon, o.lat])]) });
      line.setStyle(new Style({ stroke: new Stroke({ color: "#4a5a66", width: 1, lineDash: [2, 3] }) }));
      features.push(u, pt, line);
    });
    if (p.estimate && p.observations.length > 1) {
      const e = new Feature({ geometry: circle(p.estimate.lat, p.estimate.lon, p.estimate.uncertaintyM) });
      e.setStyle(new Style({ stroke: new Stroke({ color: "#0b4f6c", width: 3 }) }));
      const ep = new Feature({ geometry: new Point(fromLonLat([p.estimate.lon, p.estimate.lat])) });
      ep.setStyle(new Style({ image: new RegularShape({ points: 3, radius: 8, fill: new Fill({ color: "#0b4f6c" }) }) }));
      features.push(e, ep);
    }
    src.addFeatures(features);
    const ext = createEmpty();
    for (const f of features) {
      const g = f.getGeometry();
      if (g) extend(ext, g.getExtent());
    }
    if (!isEmpty(ext)) map.current?.getView().fit(ext, { padding: [40, 40, 40, 40], maxZoom: 17, duration: 200 });
  }, [props.preview]);

  return <div ref={el} className="h-80 w-full rounded-md border border-mist bg-tide-light" role="img" aria-label={props.label ?? "Map of the aids and the report diagram"} data-testid="report-map" />;
}
