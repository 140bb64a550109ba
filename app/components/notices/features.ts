/** NoticeView → MapView features (pure). */
import type { MapFeature, MapGeometry } from "~/components/map/MapView";
import { noticeGeometry } from "~/lib/notices/geojson";
import type { NoticeView } from "~/lib/notices/types";

export function noticeMapFeature(n: Pick<NoticeView, "id" | "parts" | "urgency" | "effectiveStatus" | "seriesNumber" | "title">, withLink = true): MapFeature {
  return {
    type: "Feature",
    id: n.id,
    geometry: noticeGeometry(n) as MapGeometry | null,
    properties: {
      symbol: "notice",
      urgency: n.urgency,
      status: n.effectiveStatus,
      label: n.seriesNumber ?? "Draft",
      title: n.title,
      href: withLink ? `/notices/${n.id}` : undefined,
    },
  };
}

export type AidLite = { id: number; code: string; name: string; lat: number; lon: number; ialaCategory: string | null; aidType: string; status: string };

export function aidMapFeature(a: AidLite): MapFeature {
  return {
    type: "Feature",
    id: `aid-${a.id}`,
    geometry: { type: "Point", coordinates: [a.lon, a.lat] },
    properties: { symbol: "aid", ialaCategory: a.ialaCategory, aidType: a.aidType, status: a.status, label: a.code },
  };
}
