import type { LonLat, PartGeometry } from "./geometry";
import type { GeneralType, NoticeStatus, PartKind } from "./vocabulary";

export type NoticePart = {
  id?: number;
  seq: number;
  kind: PartKind;
  /** Exactly as entered, one position per line. */
  positionsText: string;
  /** The CRS the positions were entered in, e.g. "EPSG:4230". */
  crs: string;
  radiusNm: number | null;
  /** The entered positions converted to WGS 84, [lon, lat], in entered order. */
  coordinates: LonLat[];
  /** WGS 84 geometry (a circle as its polygon). */
  geometry: PartGeometry;
};

/** A notice as read by pages, the API, feeds and mail (dates as ISO strings, UTC). */
export type NoticeView = {
  id: number;
  harbourId: number;
  seriesNumber: string | null; // "KSH 2026/014" once published
  seriesCode: string | null;
  year: number | null;
  number: number | null;
  title: string;
  generalType: GeneralType;
  detailTypes: number[];
  restrictions: number[];
  urgency: "urgent" | "routine";
  /** Stored status. */
  status: NoticeStatus;
  /** Status as of now: an in-force notice past its end reads as expired before the worker runs. */
  effectiveStatus: NoticeStatus;
  positionStatus: "reported" | "located";
  validFrom: string;
  validUntil: string | null;
  generalArea: string;
  locality: string;
  charts: string;
  body: string;
  supersedesNoticeId: number | null;
  supersedesSeriesNumber: string | null;
  supersededByNoticeId: number | null;
  supersededBySeriesNumber: string | null;
  relatedRefs: string;
  cancellationReason: string | null;
  publishedAt: string | null;
  cancelledAt: string | null;
  expiredAt: string | null;
  outsideBoundaryAccepted: boolean;
  version: number;
  createdAt: string;
  updatedAt: string;
  parts: NoticePart[];
  aids: { id: number; code: string; name: string }[];
  reportIds: number[];
};
