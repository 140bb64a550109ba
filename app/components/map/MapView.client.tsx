// The OpenLayers side of MapView (see MapView.tsx for the props). Loaded lazily in the browser only.
import "ol/ol.css";
import OlMap from "ol/Map";
import View from "ol/View";
import Feature from "ol/Feature";
import type { FeatureLike } from "ol/Feature";
import GeoJSON from "ol/format/GeoJSON";
import { LineString, Point, type Geometry } from "ol/geom";
import type { Circle as OlCircle, LineString as OlLineString, Point as OlPoint, Polygon as OlPolygon } from "ol/geom";
import Draw from "ol/interaction/Draw";
// Vector image layers: each draws its features into an image of its own when its data or the view
// changes, and other frames only compose that image (a plain vector layer draws every feature again
// on every frame, e.g. all the aids once more when the notices arrive or an icon finishes loading).
import VectorLayer from "ol/layer/VectorImage";
import { fromLonLat, toLonLat, transformExtent } from "ol/proj";
import { createEmpty, extend, getCenter, isEmpty } from "ol/extent";
import LayerGroup from "ol/layer/Group";
import VectorSource from "ol/source/Vector";
import { Circle as CircleStyle, Fill, Icon, Stroke, Style, Text } from "ol/style";
import { useEffect, useRef } from "react";
import { direct, inverse } from "~/lib/geo/geodesy";
import type { Bbox, LonLat, MapFeature, MapViewProps } from "./MapView";
import { aidSymbol, NOTICE_COLOURS, noticePointSymbol, svgDataUri } from "./symbols";

const geojson = new GeoJSON({ dataProjection: "EPSG:4326", featureProjection: "EPSG:3857" });

const BASEMAP_STYLES: Record<string, Style> = {
  land: new Style({ fill: new Fill({ color: "#efe6cf" }), stroke: new Stroke({ color: "#8a7a55", width: 1 }) }),
  basin: new Style({ fill: new Fill({ color: "#cfe6ee" }), stroke: new Stroke({ color: "#6f8f99", width: 1 }) }),
  breakwater: new Style({ stroke: new Stroke({ color: "#4a4a4a", width: 4 }) }),
  shoal: new Style({ fill: new Fill({ color: "rgba(120,170,200,0.35)" }), stroke: new Stroke({ color: "#3d7ea6", width: 1, lineDash: [2, 3] }) }),
};

const iconCache = new Map<string, Style>();
function iconStyle(svg: string, scale = 1, anchorY = 1): Style {
  const key = `${svg}|${scale}|${anchorY}`;
  let s = iconCache.get(key);
  if (!s) {
    s = new Style({ image: new Icon({ src: svgDataUri(svg), scale, anchor: [0.5, anchorY] }) });
    iconCache.set(key, s);
  }
  return s;
}

// One label style per text and offset, reused on every frame (OpenLayers caches the drawn label
// per style, so new Style objects each frame meant drawing every label again).
const labelCache = new Map<string, Style>();
function label(text: unknown, offsetY = 14): Style | null {
  if (typeof text !== "string" || !text) return null;
  const key = `${offsetY}|${text}`;
  let s = labelCache.get(key);
  if (!s) {
    s = newLabel(text, offsetY);
    labelCache.set(key, s);
  }
  return s;
}

function newLabel(text: string, offsetY: number): Style {
  return new Style({
    text: new Text({
      text,
      offsetY,
      font: "600 12px 'Public Sans', sans-serif",
      fill: new Fill({ color: "#0f2530" }),
      stroke: new Stroke({ color: "rgba(255,255,255,0.9)", width: 3 }),
    }),
  });
}

// Styles made of constants are made once: OpenLayers calls featureStyle for every feature on
// every frame it redraws, and a CircleStyle draws its own canvas each time one is constructed.
const styleCache = new Map<string, Style>();
function cached(key: string, make: () => Style): Style {
  let s = styleCache.get(key);
  if (!s) {
    s = make();
    styleCache.set(key, s);
  }
  return s;
}

/**
 * Aid labels (their codes) only from about zoom 14 (≤ 10 m per pixel): at the scale of the whole
 * harbour hundreds of codes overlap into an unreadable smear, and drawing them was most of the
 * map's first frame.
 */
const AID_LABEL_MAX_RESOLUTION_M = 10;

function featureStyle(f: FeatureLike, resolution: number): Style | Style[] {
  const p = f.getProperties() as Record<string, unknown>;
  const symbol = String(p.symbol ?? "");
  const styles: Style[] = [];
  const geomType = f.getGeometry()?.getType();
  switch (symbol) {
    case "aid": {
      styles.push(iconStyle(aidSymbol(p.ialaCategory as string | null, p.aidType as string | null), 0.9, p.ialaCategory ? 1 : 0.5));
      if (p.status && p.status !== "operating") {
        styles.push(cached("aid-status", () => new Style({ image: new CircleStyle({ radius: 13, stroke: new Stroke({ color: NOTICE_COLOURS.urgent, width: 2, lineDash: [3, 2] }) }) })));
      }
      const l = resolution <= AID_LABEL_MAX_RESOLUTION_M ? label(p.label, 12) : null;
      if (l) styles.push(l);
      return styles;
    }
    case "notice": {
      const ended = p.status !== undefined && p.status !== "in_force" && p.status !== "draft";
      const urgent = p.urgency === "urgent";
      const colour = ended ? NOTICE_COLOURS.ended : urgent ? NOTICE_COLOURS.urgent : NOTICE_COLOURS.routine;
      if (geomType === "Point") styles.push(iconStyle(noticePointSymbol(urgent, ended), 1, 0.5));
      else {
        styles.push(
          cached(
            `notice-area|${ended}|${urgent}`,
            () =>
              new Style({
                stroke: new Stroke({ color: colour, width: urgent ? 3 : 2, lineDash: ended ? [6, 4] : undefined }),
                fill: new Fill({ color: ended ? "rgba(107,119,128,0.12)" : urgent ? "rgba(180,65,11,0.18)" : "rgba(11,79,108,0.15)" }),
              }),
          ),
        );
      }
      const l = label(p.label, geomType === "Point" ? 20 : 0);
      if (l) styles.push(l);
      return styles;
    }
    case "circle":
    case "area":
      styles.push(cached(`area|${String(p.stroke)}|${String(p.fill)}`, () => new Style({ stroke: new Stroke({ color: String(p.stroke ?? "#1b7f93"), width: 2 }), fill: new Fill({ color: String(p.fill ?? "rgba(27,127,147,0.12)") }) })));
      break;
    case "uncertainty":
      styles.push(cached(`uncertainty|${String(p.stroke)}|${String(p.fill)}`, () => new Style({ stroke: new Stroke({ color: String(p.stroke ?? "#b4410b"), width: 2, lineDash: [5, 4] }), fill: new Fill({ color: String(p.fill ?? "rgba(180,65,11,0.08)") }) })));
      break;
    case "observed":
      styles.push(
        cached(
          "observed",
          () =>
            new Style({
              image: new CircleStyle({ radius: 6, stroke: new Stroke({ color: "#b4410b", width: 2.5 }), fill: new Fill({ color: "rgba(255,255,255,0.8)" }) }),
            }),
        ),
      );
      break;
    case "draft":
      styles.push(
        cached(
          "draft",
          () =>
            new Style({
              stroke: new Stroke({ color: NOTICE_COLOURS.draft, width: 2.5, lineDash: [6, 4] }),
              fill: new Fill({ color: "rgba(27,127,147,0.15)" }),
              image: new CircleStyle({ radius: 6, fill: new Fill({ color: NOTICE_COLOURS.draft }), stroke: new Stroke({ color: "#fff", width: 2 }) }),
            }),
        ),
      );
      break;
    default:
      styles.push(cached("default", () => new Style({ stroke: new Stroke({ color: "#0b4f6c", width: 2 }), image: new CircleStyle({ radius: 5, fill: new Fill({ color: "#0b4f6c" }) }) })));
  }
  const l = label(p.label, geomType === "Point" ? 16 : 0);
  if (l) styles.push(l);
  return styles;
}

/**
 * A geodesic circle as a closed ring of 72 points (as circleRing in ~/lib/notices/geometry, which is
 * not imported here: that module brings proj4 and turf, ~50 kB the map does not need).
 */
function ring(centre: LonLat, radiusM: number, vertices = 72): LonLat[] {
  const out: LonLat[] = [];
  for (let i = 0; i < vertices; i++) {
    const p = direct(centre[1], centre[0], (360 - (i * 360) / vertices) % 360, radiusM);
    out.push([p.lon, p.lat]);
  }
  out.push(out[0]!);
  return out;
}

/** Circles and uncertainty circles arrive as a centre and a radius: draw them geodesically. */
function expand(features: MapFeature[]): MapFeature[] {
  return features.map((f) => {
    const radiusM = Number(f.properties.radiusM);
    if ((f.properties.symbol === "circle" || f.properties.symbol === "uncertainty") && f.geometry?.type === "Point" && radiusM > 0) {
      return { ...f, geometry: { type: "Polygon", coordinates: [ring(f.geometry.coordinates, radiusM)] } };
    }
    return f;
  });
}

function readFeatures(features: MapFeature[]): Feature<Geometry>[] {
  return geojson.readFeatures({ type: "FeatureCollection", features: expand(features).filter((f) => f.geometry) }) as Feature<Geometry>[];
}

function visibleBbox(map: OlMap): Bbox | null {
  const size = map.getSize();
  if (!size) return null;
  const e = transformExtent(map.getView().calculateExtent(size), "EPSG:3857", "EPSG:4326");
  const clamp = (v: number, m: number) => Math.max(-m, Math.min(m, v));
  return [clamp(e[0]!, 180), clamp(e[1]!, 85), clamp(e[2]!, 180), clamp(e[3]!, 85)];
}

// DDM labels on the graticule, as mariners read a chart border.
const ddm = (v: number, pos: string, neg: string) => {
  const a = Math.abs(v);
  const d = Math.floor(a + 1e-9);
  const m = (a - d) * 60;
  return `${d}°${m.toFixed(m % 1 < 0.01 || m % 1 > 0.99 ? 0 : 1).padStart(2, "0")}′${v >= 0 ? pos : neg}`;
};

const GRATICULE_INTERVALS_DEG = [10, 5, 2, 1, 0.5, 0.2, 1 / 12, 1 / 30, 1 / 60];
const GRATICULE_LINE = new Style({ stroke: new Stroke({ color: "rgba(15,37,48,0.25)", width: 1, lineDash: [2, 4] }) });
const graticuleLabel = (text: string, edge: "bottom" | "right") =>
  new Style({
    text: new Text({
      text,
      font: "12px 'Public Sans', sans-serif",
      fill: new Fill({ color: "#0f2530" }),
      stroke: new Stroke({ color: "rgba(255,255,255,0.9)", width: 3 }),
      textAlign: edge === "bottom" ? "center" : "end",
      textBaseline: edge === "bottom" ? "bottom" : "middle",
      offsetX: edge === "right" ? -4 : 0,
      offsetY: edge === "bottom" ? -2 : 0,
    }),
  });

/**
 * Meridians and parallels about the visible extent, at the finest interval that keeps them at
 * least 100 px apart, with DDM labels along the bottom and right edges as on a chart border.
 * In Web Mercator both are straight lines, so two points make each line: OpenLayers' Graticule
 * layer (which samples every line so that it works in any projection) was the costliest layer
 * to draw. Lines run a view's width and height past each edge, so a pan shows them before they
 * are computed again at the end of the move.
 */
function graticule(map: OlMap): Feature<Geometry>[] {
  const size = map.getSize();
  if (!size || !size[0] || !size[1]) return [];
  const [minLon, minLat, maxLon, maxLat] = transformExtent(map.getView().calculateExtent(size), "EPSG:3857", "EPSG:4326") as [number, number, number, number];
  if (!(maxLon > minLon) || !(maxLat > minLat)) return [];
  const pxPerDeg = size[0] / (maxLon - minLon);
  const step = [...GRATICULE_INTERVALS_DEG].reverse().find((d) => d * pxPerDeg >= 100) ?? GRATICULE_INTERVALS_DEG[0]!;
  const w = maxLon - minLon;
  const south = Math.max(-85, minLat - (maxLat - minLat));
  const north = Math.min(85, maxLat + (maxLat - minLat));
  const out: Feature<Geometry>[] = [];
  const add = (geometry: Geometry, style: Style) => {
    const f = new Feature(geometry);
    f.setStyle(style);
    out.push(f);
  };
  for (let k = Math.ceil((minLon - w) / step); k * step <= maxLon + w; k++) {
    const lon = k * step;
    add(new LineString([fromLonLat([lon, south]), fromLonLat([lon, north])]), GRATICULE_LINE);
    if (lon >= minLon && lon <= maxLon) add(new Point(fromLonLat([lon, minLat])), graticuleLabel(ddm(lon, "E", "W"), "bottom"));
  }
  for (let k = Math.ceil(south / step); k * step <= north; k++) {
    const lat = k * step;
    add(new LineString([fromLonLat([minLon - w, lat]), fromLonLat([maxLon + w, lat])]), GRATICULE_LINE);
    if (lat >= minLat && lat <= maxLat) add(new Point(fromLonLat([maxLon, lat])), graticuleLabel(ddm(lat, "N", "S"), "right"));
  }
  return out;
}

export default function MapViewClient(props: MapViewProps) {
  const target = useRef<HTMLDivElement>(null);
  const mapRef = useRef<OlMap | null>(null);
  // One vector layer per MapLayer id, inside one group above the base map, so new features in
  // one layer (the notices of the visible extent) leave the others (the aids) as drawn.
  const featureGroup = useRef(new LayerGroup({ visible: false }));
  const featureLayers = useRef(new Map<string, { layer: VectorLayer<VectorSource>; features: MapFeature[] }>());
  const isFeatureLayer = (l: unknown) => featureGroup.current.getLayers().getArray().includes(l as VectorLayer<VectorSource>);
  const baseSource = useRef(new VectorSource());
  const drawRef = useRef<Draw | null>(null);
  const handlers = useRef(props);
  handlers.current = props;

  // Create the map once.
  useEffect(() => {
    if (!target.current) return;
    const layers = [];
    layers.push(
      new VectorLayer({
        source: baseSource.current,
        style: (f) => BASEMAP_STYLES[String(f.get("kind"))] ?? BASEMAP_STYLES.land!,
      }),
      featureGroup.current,
    );
    const map = new OlMap({ target: target.current, layers, view: new View({ center: fromLonLat([3.04, 55.21]), zoom: 12, maxZoom: 19 }) });
    // Drawn in three steps, each in a task of its own after the frame before it: the base map,
    // then the features (symbols and labels), then the graticule. One frame with everything was a
    // ~270 ms task under the 4× CPU slowdown of Lighthouse's mobile preset, blocking input.
    const graticuleSource = new VectorSource();
    let graticuleShown = false;
    const drawGraticule = () => {
      graticuleSource.clear(true);
      graticuleSource.addFeatures(graticule(map));
    };
    const steps = [
      () => featureGroup.current.setVisible(true),
      () => {
        graticuleShown = true;
        drawGraticule();
        map.getLayers().insertAt(map.getLayers().getLength() - 1, new VectorLayer({ source: graticuleSource }));
      },
    ];
    let stepTimer: ReturnType<typeof setTimeout> | undefined;
    const nextStep = () => {
      const step = steps.shift();
      if (!step) return;
      stepTimer = setTimeout(() => {
        map.once("postrender", nextStep);
        step();
      }, 0);
    };
    map.once("postrender", nextStep);
    // Tiles only where a tile service is configured (MAP_TILE_URL): their code is a chunk of its own.
    let live = true;
    if (props.tileUrl) {
      const url = props.tileUrl;
      void Promise.all([import("ol/layer/Tile"), import("ol/source/XYZ")]).then(([{ default: TileLayer }, { default: XYZ }]) => {
        if (live) map.getLayers().insertAt(0, new TileLayer({ source: new XYZ({ url, crossOrigin: "anonymous" }) }));
      });
    }
    map.on("moveend", () => {
      if (graticuleShown) drawGraticule();
      const bbox = visibleBbox(map);
      if (bbox) handlers.current.onMoveEnd?.(bbox);
    });
    map.on("singleclick", (evt) => {
      if (drawRef.current) return;
      const f = map.forEachFeatureAtPixel(evt.pixel, (feat) => feat, { layerFilter: isFeatureLayer });
      if (!f) return;
      const p = f.getProperties();
      if (handlers.current.onFeatureClick) handlers.current.onFeatureClick(p);
      else if (typeof p.href === "string") window.location.assign(p.href);
    });
    map.on("pointermove", (evt) => {
      const hit = map.hasFeatureAtPixel(evt.pixel, { layerFilter: isFeatureLayer });
      const el = map.getTargetElement();
      if (el) el.style.cursor = hit ? "pointer" : "";
    });
    mapRef.current = map;
    return () => {
      live = false;
      clearTimeout(stepTimer);
      map.setTarget(undefined);
      mapRef.current = null;
    };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  // Base map.
  useEffect(() => {
    baseSource.current.clear();
    if (props.basemap) baseSource.current.addFeatures(geojson.readFeatures(props.basemap) as Feature<Geometry>[]);
  }, [props.basemap]);

  // Layers.
  useEffect(() => {
    const group = featureGroup.current.getLayers();
    const wanted = new Set<string>();
    (props.layers ?? []).forEach((l, i) => {
      wanted.add(l.id);
      let entry = featureLayers.current.get(l.id);
      if (!entry) {
        entry = { layer: new VectorLayer({ source: new VectorSource(), style: featureStyle }), features: [] };
        featureLayers.current.set(l.id, entry);
        group.insertAt(Math.min(i, group.getLength()), entry.layer);
      }
      if (entry.features === l.features) return;
      entry.features = l.features;
      const source = entry.layer.getSource()!;
      source.clear(true);
      source.addFeatures(readFeatures(l.features));
    });
    for (const [id, entry] of featureLayers.current) {
      if (wanted.has(id)) continue;
      group.remove(entry.layer);
      featureLayers.current.delete(id);
    }
  }, [props.layers]);

  const allFeaturesExtent = () => {
    const e = createEmpty();
    for (const { layer } of featureLayers.current.values()) {
      const x = layer.getSource()?.getExtent();
      if (x) extend(e, x);
    }
    return e;
  };

  // Fit once (and again when fitKey changes).
  useEffect(() => {
    const map = mapRef.current;
    if (!map) return;
    let extent: number[] | null = null;
    if (Array.isArray(props.fit)) extent = transformExtent(props.fit, "EPSG:4326", "EPSG:3857");
    else {
      const only = props.fitLayerId ? props.layers?.find((l) => l.id === props.fitLayerId) : undefined;
      const e = only && only.features.length ? new VectorSource({ features: readFeatures(only.features) }).getExtent() : allFeaturesExtent();
      extent = e && !isEmpty(e) && Number.isFinite(e[0]) ? e : baseSource.current.getExtent();
    }
    if (!extent || isEmpty(extent) || !Number.isFinite(extent[0])) return;
    if (extent[2]! - extent[0]! < 1 && extent[3]! - extent[1]! < 1) {
      map.getView().setCenter(getCenter(extent));
      map.getView().setZoom(14);
    } else map.getView().fit(extent, { padding: [30, 30, 30, 30], maxZoom: 15 });
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [props.fitKey, Array.isArray(props.fit) ? props.fit.join(",") : props.fit]);

  // Drawing.
  const mode = props.draw?.mode ?? null;
  useEffect(() => {
    const map = mapRef.current;
    if (!map) return;
    if (drawRef.current) {
      map.removeInteraction(drawRef.current);
      drawRef.current = null;
    }
    if (!mode) return;
    const draw = new Draw({ source: new VectorSource(), type: mode });
    draw.on("drawend", (e) => {
      const g = e.feature.getGeometry();
      const cb = handlers.current.draw?.onDrawEnd;
      if (!g || !cb) return;
      const ll = (c: number[]) => {
        const [lon, lat] = toLonLat(c);
        return [round(lon!), round(lat!)] as LonLat;
      };
      if (g.getType() === "Point") cb({ type: "Point", coordinates: ll((g as OlPoint).getCoordinates()) });
      else if (g.getType() === "LineString") cb({ type: "LineString", coordinates: (g as OlLineString).getCoordinates().map(ll) });
      else if (g.getType() === "Polygon") cb({ type: "Polygon", coordinates: (g as OlPolygon).getCoordinates().map((r) => r.map(ll)) });
      else if (g.getType() === "Circle") {
        const c = g as OlCircle;
        const centre = ll(c.getCenter());
        const edge = ll([c.getCenter()[0]! + c.getRadius(), c.getCenter()[1]!]);
        cb({ type: "Circle", centre, radiusM: inverse(centre[1], centre[0], edge[1], edge[0]).distanceM });
      }
    });
    map.addInteraction(draw);
    drawRef.current = draw;
  }, [mode]);

  return <div ref={target} className="h-full w-full" />;
}

function round(v: number): number {
  return Math.round(v * 1e6) / 1e6;
}
