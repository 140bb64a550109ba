// What a digest says: the changes to notices inside its window that concern the subscriber,
// one line per notice (its latest change wins), grouped by general type in S-124 order.
import { formatPosition } from "../geo/positions";
import { GENERAL_TYPES, generalTypeLabel } from "../notices/vocabulary";
import type { LonLat } from "./area";
import type { NoticePartShape } from "./matching";

export type ChangeKind = "published" | "amended" | "cancelled" | "expired";
/** How a digest words a change. */
export type DigestChange = "new" | "amended" | "cancelled" | "expired";

export const CHANGE_LABELS: Record<DigestChange, string> = {
  new: "New",
  amended: "Amended",
  cancelled: "Cancelled",
  expired: "Expired",
};

export type DigestNotice = {
  id: number;
  seriesNumber: string | null;
  title: string;
  generalType: string;
  urgency: "urgent" | "routine";
  validUntil: Date | null;
  parts: NoticePartShape[];
};

export type DigestItem = { notice: DigestNotice; change: DigestChange; at: Date; positions: string[] };
export type DigestGroup = { generalType: string; label: string; items: DigestItem[] };

const pos = ([lon, lat]: LonLat) => formatPosition(lat, lon, "ddm", { decimals: 2 });
const nm = (v: number) => String(Math.round(v * 100) / 100);

/** Positions as mariners write them (degrees and decimal minutes). */
export function positionLines(parts: NoticePartShape[]): string[] {
  return parts.flatMap((p) => {
    if (p.coordinates.length === 0) return [];
    if (p.kind === "point") return [pos(p.coordinates[0])];
    if (p.kind === "circle") return [`within ${nm(p.radiusNm ?? 0)} M of ${pos(p.coordinates[0])}`];
    const pts = p.kind === "area" && p.coordinates.length > 1 && p.coordinates[0][0] === p.coordinates.at(-1)![0] && p.coordinates[0][1] === p.coordinates.at(-1)![1] ? p.coordinates.slice(0, -1) : p.coordinates;
    return [`${p.kind === "line" ? "line" : "area"}: ${pts.map(pos).join(" – ")}`];
  });
}

/**
 * The word for a notice's changes inside one window: a cancellation or expiry is final; a
 * notice first published inside the window is "new" even if it was amended since.
 */
export function summariseChanges(kinds: ChangeKind[]): DigestChange {
  if (kinds.includes("cancelled")) return "cancelled";
  if (kinds.includes("expired")) return "expired";
  if (kinds.includes("published")) return "new";
  return "amended";
}

const ORDER = new Map<string, number>(GENERAL_TYPES.map((g, i) => [g.key, i]));
const CHANGE_ORDER: Record<DigestChange, number> = { new: 0, amended: 1, cancelled: 2, expired: 3 };

export function groupDigest(items: DigestItem[]): DigestGroup[] {
  const groups = new Map<string, DigestItem[]>();
  for (const item of items) {
    const list = groups.get(item.notice.generalType) ?? [];
    list.push(item);
    groups.set(item.notice.generalType, list);
  }
  return [...groups.entries()]
    .sort(([a], [b]) => (ORDER.get(a) ?? 99) - (ORDER.get(b) ?? 99) || a.localeCompare(b))
    .map(([generalType, list]) => ({
      generalType,
      label: generalTypeLabel(generalType),
      items: list.sort(
        (a, b) =>
          CHANGE_ORDER[a.change] - CHANGE_ORDER[b.change] ||
          (a.notice.urgency === b.notice.urgency ? 0 : a.notice.urgency === "urgent" ? -1 : 1) ||
          (a.notice.seriesNumber ?? "").localeCompare(b.notice.seriesNumber ?? "") ||
          a.notice.id - b.notice.id,
      ),
    }));
}
