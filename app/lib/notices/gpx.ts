/** GPX 1.1 (topografix.com/GPX/1/1) of a notice's positions: points as waypoints, lines and areas as routes. */
import { formatPosition } from "../geo/positions";
import type { NoticeView } from "./types";

function esc(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

export function renderGpx(n: NoticeView, appName = "Tidewire"): string {
  const name = n.seriesNumber ? `${n.seriesNumber} ${n.title}` : n.title;
  const out: string[] = [
    `<?xml version="1.0" encoding="UTF-8"?>`,
    `<gpx version="1.1" creator="${esc(appName)}" xmlns="http://www.topografix.com/GPX/1/1">`,
    `  <metadata><name>${esc(name)}</name><desc>${esc("Positions in WGS 84. Tidewire informs; it does not replace official charts or notices.")}</desc><time>${new Date(n.updatedAt).toISOString()}</time></metadata>`,
  ];
  const label = n.seriesNumber ?? `Draft ${n.id}`;
  const pt = (tag: string, [lon, lat]: [number, number], nm: string, indent: string) =>
    `${indent}<${tag} lat="${lat.toFixed(7)}" lon="${lon.toFixed(7)}"><name>${esc(nm)}</name><desc>${esc(formatPosition(lat, lon, "ddm"))}</desc></${tag}>`;
  for (const part of n.parts) {
    if (part.kind === "point" || part.kind === "circle") {
      const extra = part.kind === "circle" ? ` centre, radius ${part.radiusNm} M` : "";
      out.push(pt("wpt", part.coordinates[0]!, `${label} part ${part.seq}${extra}`, "  "));
    }
  }
  for (const part of n.parts) {
    if (part.kind === "line" || part.kind === "area") {
      const coords = part.kind === "area" ? [...part.coordinates, part.coordinates[0]!] : part.coordinates;
      out.push(`  <rte><name>${esc(`${label} part ${part.seq} (${part.kind})`)}</name>`);
      coords.forEach((c, i) => out.push(pt("rtept", c, `${label}-${part.seq}-${i + 1}`, "    ")));
      out.push(`  </rte>`);
    }
  }
  out.push(`</gpx>`);
  return out.join("\n") + "\n";
}
