/**
 * GeoJSON per RFC 7946: WGS 84 longitude, latitude order (§3.1.1, §4); polygon exterior rings
 * counter-clockwise (§3.1.6, right-hand rule); a notice with several parts is a
 * GeometryCollection (§3.1.8). Extra members stay in `properties`.
 */
import { closedCcwRing, type PartGeometry } from "./geometry";
import type { NoticeView } from "./types";
import { detailTypeLabel, generalTypeLabel, restrictionLabel } from "./vocabulary";

export type Geometry = PartGeometry | { type: "GeometryCollection"; geometries: PartGeometry[] };
export type NoticeFeature = { type: "Feature"; id: number; geometry: Geometry | null; properties: Record<string, unknown> };

function rfc7946(g: PartGeometry): PartGeometry {
  if (g.type !== "Polygon") return g;
  return { type: "Polygon", coordinates: g.coordinates.map((ring, i) => (i === 0 ? closedCcwRing(ring) : closedCcwRing(ring).reverse())) };
}

export function noticeGeometry(n: Pick<NoticeView, "parts">): Geometry | null {
  if (n.parts.length === 0) return null;
  if (n.parts.length === 1) return rfc7946(n.parts[0]!.geometry);
  return { type: "GeometryCollection", geometries: n.parts.map((p) => rfc7946(p.geometry)) };
}

export function noticeToFeature(n: NoticeView, opts: { baseUrl?: string; full?: boolean } = {}): NoticeFeature {
  const base = opts.baseUrl ?? "";
  const props: Record<string, unknown> = {
    seriesNumber: n.seriesNumber,
    title: n.title,
    generalType: n.generalType,
    generalTypeLabel: generalTypeLabel(n.generalType),
    detailTypes: n.detailTypes.map((code) => ({ code, label: detailTypeLabel(code) })),
    restrictions: n.restrictions.map((code) => ({ code, label: restrictionLabel(code) })),
    urgency: n.urgency,
    status: n.effectiveStatus,
    validFrom: n.validFrom,
    validUntil: n.validUntil,
    publishedAt: n.publishedAt,
    updatedAt: n.updatedAt,
    cancelledAt: n.cancelledAt,
    cancellationReason: n.cancellationReason,
    url: `${base}/notices/${n.id}`,
  };
  if (opts.full) {
    Object.assign(props, {
      generalArea: n.generalArea,
      locality: n.locality,
      charts: n.charts,
      text: n.body,
      positionStatus: n.positionStatus,
      supersedes: n.supersedesNoticeId ? { id: n.supersedesNoticeId, seriesNumber: n.supersedesSeriesNumber } : null,
      supersededBy: n.supersededByNoticeId ? { id: n.supersededByNoticeId, seriesNumber: n.supersededBySeriesNumber } : null,
      relatedRefs: n.relatedRefs,
      expiredAt: n.expiredAt,
      version: n.version,
      aids: n.aids,
      reportIds: n.reportIds,
      parts: n.parts.map((p) => ({
        seq: p.seq,
        kind: p.kind,
        crs: p.crs,
        positionsAsEntered: p.positionsText.split(/\r?\n/).filter((l) => l.trim() !== ""),
        positionsWgs84: p.coordinates,
        radiusNm: p.radiusNm,
      })),
      gpxUrl: `${base}/notices/${n.id}/gpx`,
    });
  } else {
    props.kinds = [...new Set(n.parts.map((p) => p.kind))];
  }
  return { type: "Feature", id: n.id, geometry: noticeGeometry(n), properties: props };
}
