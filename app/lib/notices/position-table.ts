/** Rows of a notice's position table: as entered, WGS 84 (DDM and DD), and a reader-chosen CRS. */
import { fromWgs84, isGeographicCoord, listCrs, resolveCrs } from "../geo/crs";
import { formatPosition } from "../geo/positions";
import { positionLines } from "./geometry";
import type { NoticeView } from "./types";

export type PositionRow = { part: number; index: number; entered: string; wgs84Ddm: string; wgs84Dd: string; chosen: string | null };

export function formatInCrs(crs: string, lat: number, lon: number): string {
  try {
    const c = fromWgs84(crs, lat, lon);
    if (isGeographicCoord(c)) return formatPosition(c.lat, c.lon, "ddm", { decimals: 3 });
    return `E ${c.easting.toFixed(1)} m  N ${c.northing.toFixed(1)} m`;
  } catch {
    return "not representable in this CRS";
  }
}

export function positionRows(n: Pick<NoticeView, "parts">, chosenCrs: string | null): PositionRow[] {
  const rows: PositionRow[] = [];
  for (const p of n.parts) {
    const entered = positionLines(p.positionsText).map((l) => l.text);
    p.coordinates.forEach(([lon, lat], i) => {
      rows.push({
        part: p.seq,
        index: i + 1,
        entered: entered[i] ?? "",
        wgs84Ddm: formatPosition(lat, lon, "ddm", { decimals: 3 }),
        wgs84Dd: formatPosition(lat, lon, "dd", { decimals: 6 }),
        chosen: chosenCrs ? formatInCrs(chosenCrs, lat, lon) : null,
      });
    });
  }
  return rows;
}

/** CRS options for pickers: all geographic and national grids, and the UTM zones near the harbour. */
export function crsOptions(utmZones: number[] = [30, 31, 32]): { value: string; label: string }[] {
  return listCrs()
    .filter((c) => c.group !== "UTM" || utmZones.some((z) => c.label.includes(`UTM zone ${z}N`)))
    .map((c) => ({ value: c.id, label: `${c.label} (${c.id})` }));
}

export function crsLabel(id: string): string {
  try {
    const c = resolveCrs(id);
    return `${c.label} (${c.id})`;
  } catch {
    return id;
  }
}
