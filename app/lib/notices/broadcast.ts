/**
 * Broadcast-style plain text of a notice, in the order of the joint IMO/IHO/WMO Manual on
 * Maritime Safety Information (MSC.1/Circ.1310 §5.5, see TRADE.md): series identifier and
 * number/year; general area; locality; chart number(s); key subject; geographical
 * position(s); amplifying remarks; cancellation. Upper case, positions as `DD-MM.mmN DDD-MM.mmW`.
 */
import { formatPosition } from "../geo/positions";
import { msiVertexOrder, type LonLat } from "./geometry";
import type { NoticeView } from "./types";
import { detailTypeLabel, restrictionLabel } from "./vocabulary";

const pos = ([lon, lat]: LonLat) => formatPosition(lat, lon, "broadcast");

function ddhhmmUtc(iso: string): string {
  // Date-time group as used in MSI text: DDHHMM UTC MON YY (common practice).
  const d = new Date(iso);
  const mon = ["JAN", "FEB", "MAR", "APR", "MAY", "JUN", "JUL", "AUG", "SEP", "OCT", "NOV", "DEC"][d.getUTCMonth()];
  const p2 = (n: number) => String(n).padStart(2, "0");
  return `${p2(d.getUTCDate())}${p2(d.getUTCHours())}${p2(d.getUTCMinutes())} UTC ${mon} ${p2(d.getUTCFullYear() % 100)}`;
}

export function positionLinesForBroadcast(notice: Pick<NoticeView, "parts">): string[] {
  const out: string[] = [];
  const letters = "ABCDEFGHIJKLMNOPQRSTUVWXYZ";
  for (const part of notice.parts) {
    if (part.kind === "point") out.push(pos(part.coordinates[0]!));
    else if (part.kind === "circle") out.push(`WITHIN ${trimNm(part.radiusNm ?? 0)} MILES OF ${pos(part.coordinates[0]!)}`);
    else if (part.kind === "line") {
      out.push("ALONG A LINE JOINING:");
      part.coordinates.forEach((c, i) => out.push(`${letters[i % 26]}. ${pos(c)}`));
    } else {
      out.push("IN AREA BOUNDED BY:");
      msiVertexOrder(part.coordinates).forEach((c, i) => out.push(`${letters[i % 26]}. ${pos(c)}`));
    }
  }
  return out;
}

function trimNm(v: number): string {
  return String(Math.round(v * 100) / 100);
}

export function renderBroadcast(n: NoticeView): string {
  const lines: string[] = [];
  lines.push(n.seriesNumber ?? "DRAFT (NOT YET NUMBERED)");
  if (n.urgency === "urgent") lines[0] += " URGENT";
  lines.push(n.generalArea.toUpperCase());
  lines.push(n.locality.toUpperCase());
  if (n.charts.trim()) lines.push(`CHART ${n.charts.trim().toUpperCase()}.`);
  const subject = [n.title, ...n.detailTypes.map(detailTypeLabel)].filter((v, i, a) => a.indexOf(v) === i)[0]!;
  const verb = n.positionStatus === "located" ? "LOCATED" : "REPORTED";
  lines.push(`${subject.toUpperCase()} ${verb}.`);
  lines.push(...positionLinesForBroadcast(n));
  const remarks: string[] = [];
  if (n.body.trim()) remarks.push(n.body.trim().replace(/\s+/g, " "));
  if (n.restrictions.length) remarks.push(`${n.restrictions.map(restrictionLabel).join(", ")}.`);
  if (n.validUntil) remarks.push(`IN FORCE ${ddhhmmUtc(n.validFrom)} TO ${ddhhmmUtc(n.validUntil)}.`);
  else remarks.push(`IN FORCE FROM ${ddhhmmUtc(n.validFrom)} UNTIL FURTHER NOTICE.`);
  lines.push(...remarks.map((r) => r.toUpperCase()));
  if (n.supersedesSeriesNumber) lines.push(`CANCEL ${n.supersedesSeriesNumber}.`);
  if (n.effectiveStatus === "cancelled" && n.cancelledAt) lines.push(`THIS NOTICE CANCELLED ${ddhhmmUtc(n.cancelledAt)}.`);
  else if (n.effectiveStatus === "superseded" && n.supersededBySeriesNumber) lines.push(`THIS NOTICE CANCELLED BY ${n.supersededBySeriesNumber}.`);
  else if (n.validUntil) lines.push(`CANCEL THIS MSG ${ddhhmmUtc(n.validUntil)}.`);
  return lines.join("\n");
}
