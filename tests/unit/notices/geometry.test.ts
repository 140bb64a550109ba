import { describe, expect, it } from "vitest";
import { toWgs84 } from "~/lib/geo/crs";
import { parsePosition } from "~/lib/geo/positions";
import { renderBroadcast } from "~/lib/notices/broadcast";
import { buildPartGeometry, msiVertexOrder, parsePositionLines, ringSignedArea2, type LonLat } from "~/lib/notices/geometry";
import { noticeGeometry, noticeToFeature } from "~/lib/notices/geojson";
import { renderGpx } from "~/lib/notices/gpx";
import { parseNoticeForm } from "~/lib/notices/schema";
import type { NoticeView } from "~/lib/notices/types";
import { formatSeriesNumber } from "~/lib/notices/vocabulary";

const square: LonLat[] = [
  [3.0, 55.2],
  [3.0, 55.21],
  [3.02, 55.21],
  [3.02, 55.2],
]; // clockwise as typed (SW, NW, NE, SE)

describe("geometry checks", () => {
  it("refuses an area that crosses itself", () => {
    const bowtie: LonLat[] = [
      [3.0, 55.2],
      [3.02, 55.21],
      [3.02, 55.2],
      [3.0, 55.21],
    ];
    const r = buildPartGeometry("area", bowtie);
    expect(r.ok).toBe(false);
    expect(!r.ok && r.error).toMatch(/cross/);
  });
  it("refuses an area of fewer than three points, a one-point line and radius 0", () => {
    expect(buildPartGeometry("area", square.slice(0, 2)).ok).toBe(false);
    expect(buildPartGeometry("line", square.slice(0, 1)).ok).toBe(false);
    const c = buildPartGeometry("circle", square.slice(0, 1), 0);
    expect(c.ok).toBe(false);
    expect(!c.ok && c.field).toBe("radiusNm");
  });
  it("accepts an area typed clockwise and stores it counter-clockwise (RFC 7946 §3.1.6)", () => {
    const r = buildPartGeometry("area", square);
    expect(r.ok).toBe(true);
    if (!r.ok || r.geometry.type !== "Polygon") throw new Error();
    const ring = r.geometry.coordinates[0]!;
    expect(ring[0]).toEqual(ring[ring.length - 1]);
    expect(ringSignedArea2(ring.slice(0, -1))).toBeGreaterThan(0);
  });
  it("a circle becomes a closed counter-clockwise polygon of the right radius", () => {
    const r = buildPartGeometry("circle", [[3.0, 55.2]], 0.5);
    if (!r.ok || r.geometry.type !== "Polygon") throw new Error();
    const ring = r.geometry.coordinates[0]!;
    expect(ringSignedArea2(ring.slice(0, -1))).toBeGreaterThan(0);
    // Northernmost vertex 0.5 M = 926 m north: about 926/1855 ≈ 0.4992′ of latitude at 55°N.
    expect((ring[0]![1] - 55.2) * 60).toBeCloseTo(0.499, 2);
  });
  it("says which line does not parse", () => {
    const lines = parsePositionLines("55°12.36′N 003°02.20′E\n55°61.00′N 003°02.20′E", "EPSG:4230");
    expect(lines[0]!.ok).toBe(true);
    expect(lines[1]!.ok).toBe(false);
    const form = parseNoticeForm(
      {
        title: "t",
        generalType: "works",
        validFrom: "2026-12-01T08:00",
        untilFurtherNotice: "on",
        generalArea: "A",
        locality: "B",
        body: "C",
        "parts.0.kind": "area",
        "parts.0.crs": "EPSG:4230",
        "parts.0.positions": "55°12.36′N 003°02.20′E\n55°61.00′N 003°02.20′E\n55°12.6N 3°02.68E",
      },
      "Europe/London",
    );
    expect(form.ok).toBe(false);
    expect(!form.ok && form.errors["parts.0.positions"]).toMatch(/^Line 2: /);
  });
  it("ED50 positions are converted with the position engine", () => {
    const [line] = parsePositionLines("55°12.36′N 003°02.20′E", "EPSG:4230");
    const p = parsePosition("55°12.36′N 003°02.20′E");
    if (!line!.ok || !p.ok) throw new Error();
    const g = toWgs84("EPSG:4230", { lat: p.lat, lon: p.lon });
    expect(line!.lat).toBe(g.lat);
    expect(line!.lon).toBe(g.lon);
    // ED50 → WGS 84 in the North Sea moves positions roughly 100 m south-west (common practice; from memory).
    expect(line!.lat).toBeLessThan(p.lat);
    expect(line!.lon).toBeLessThan(p.lon);
  });
  it("refuses an end before the start", () => {
    const form = parseNoticeForm(
      { title: "t", generalType: "works", validFrom: "2026-12-02T08:00", validUntil: "2026-12-01T08:00", generalArea: "A", locality: "B", body: "C", "parts.0.kind": "point", "parts.0.crs": "EPSG:4326", "parts.0.positions": "55 12.3N 3 02.1E" },
      "Europe/London",
    );
    expect(!form.ok && form.errors.validUntil).toMatch(/after the start/);
  });
});

function view(partial: Partial<NoticeView>): NoticeView {
  const area = buildPartGeometry("area", square);
  if (!area.ok) throw new Error();
  return {
    id: 7, harbourId: 1, seriesNumber: "KSH 2026/014", seriesCode: "KSH", year: 2026, number: 14, title: "Dredging operation", generalType: "works",
    detailTypes: [89], restrictions: [1, 27], urgency: "routine", status: "in_force", effectiveStatus: "in_force", positionStatus: "reported",
    validFrom: "2026-12-01T08:00:00.000Z", validUntil: "2026-12-22T18:00:00.000Z", generalArea: "North Sea", locality: "Kestrel Sound, inner basin",
    charts: "KS 101", body: "Keep clear of the dredger.", supersedesNoticeId: null, supersedesSeriesNumber: null, supersededByNoticeId: null,
    supersededBySeriesNumber: null, relatedRefs: "", cancellationReason: null, publishedAt: "2026-11-30T10:00:00.000Z", cancelledAt: null, expiredAt: null,
    outsideBoundaryAccepted: false, version: 2, createdAt: "2026-11-30T09:00:00.000Z", updatedAt: "2026-11-30T10:00:00.000Z",
    parts: [{ seq: 1, kind: "area", crs: "EPSG:4230", positionsText: "…", radiusNm: null, coordinates: area.coordinates, geometry: area.geometry }],
    aids: [], reportIds: [], ...partial,
  };
}

describe("renderings", () => {
  it("series numbers have three digits", () => {
    expect(formatSeriesNumber("KSH", 2026, 14)).toBe("KSH 2026/014");
  });
  it("GeoJSON: lon/lat order and counter-clockwise exterior ring (RFC 7946 §3.1.1, §3.1.6)", () => {
    const f = noticeToFeature(view({}), { full: true });
    expect(f.type).toBe("Feature");
    const g = noticeGeometry(view({}));
    if (!g || g.type !== "Polygon") throw new Error();
    // Longitude first: every x within 3.00–3.02 (E), every y within 55.20–55.21 (N).
    for (const [x, y] of g.coordinates[0]!) {
      expect(x).toBeGreaterThanOrEqual(3.0);
      expect(x).toBeLessThanOrEqual(3.02);
      expect(y).toBeGreaterThanOrEqual(55.2);
    }
    expect(ringSignedArea2(g.coordinates[0]!.slice(0, -1))).toBeGreaterThan(0);
  });
  it("broadcast text follows the MSI order with DD-MM.mmN DDD-MM.mmE positions, NW corner first, clockwise", () => {
    const text = renderBroadcast(view({}));
    const lines = text.split("\n");
    expect(lines[0]).toBe("KSH 2026/014");
    expect(lines[1]).toBe("NORTH SEA");
    expect(lines[2]).toBe("KESTREL SOUND, INNER BASIN");
    expect(lines[3]).toBe("CHART KS 101.");
    expect(lines[4]).toBe("DREDGING OPERATION REPORTED.");
    expect(lines[5]).toBe("IN AREA BOUNDED BY:");
    expect(lines[6]).toBe("A. 55-12.60N 003-00.00E"); // north-west corner
    expect(lines[7]).toBe("B. 55-12.60N 003-01.20E"); // then clockwise: north-east
    expect(lines[8]).toBe("C. 55-12.00N 003-01.20E");
    expect(text).toContain("ANCHORING PROHIBITED, SPEED RESTRICTED.");
    expect(text).toMatch(/CANCEL THIS MSG 221800 UTC DEC 26\.$/);
  });
  it("msiVertexOrder starts at the north-west corner, clockwise, whatever the typed order", () => {
    const ccw = [...square].reverse();
    expect(msiVertexOrder(ccw)[0]).toEqual([3.0, 55.21]);
    expect(msiVertexOrder(ccw)[1]).toEqual([3.02, 55.21]);
  });
  it("GPX is GPX 1.1 with lat/lon attributes", () => {
    const gpx = renderGpx(view({}));
    expect(gpx).toContain('xmlns="http://www.topografix.com/GPX/1/1"');
    expect(gpx).toMatch(/<rtept lat="55\.2000000" lon="3\.0000000">/);
  });
});
