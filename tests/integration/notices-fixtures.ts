// Shared set-up for the notices integration tests: a harbour of their own (a unique series code,
// so other test files' rows never interfere) and staff accounts.
import { randomBytes } from "node:crypto";
import { db } from "~/db.server";
import { parseNoticeForm, type NoticeInput } from "~/lib/notices/schema";
import { createUser } from "~/models/user.server";

export async function makeHarbour(): Promise<{ id: number; seriesCode: string }> {
  const seriesCode = "T" + randomBytes(3).toString("hex").toUpperCase().slice(0, 5);
  const [id] = await db("harbours").insert({
    slug: `test-${seriesCode.toLowerCase()}`,
    name: `Test harbour ${seriesCode}`,
    authority_name: "Test Harbour Authority",
    series_code: seriesCode,
    general_area: "NORTH SEA",
    default_crs: "EPSG:4326",
    time_zone: "Europe/London",
    // Same square as the Kestrel Sound demo boundary (invented waters, see DEMO.md).
    boundary: db.raw("ST_GeomFromText(?, 4326)", ["POLYGON((2.93 55.15,3.16 55.15,3.16 55.26,2.93 55.26,2.93 55.15))"]),
    basemap_geojson: JSON.stringify({ type: "FeatureCollection", features: [] }),
  });
  return { id: id!, seriesCode };
}

export async function makeStaff() {
  const tag = randomBytes(4).toString("hex");
  const officer = await createUser({ email: `officer-${tag}@example.test`, name: "Test Officer", role: "officer", password: "correct horse battery", verified: true });
  const harbourmaster = await createUser({ email: `hm-${tag}@example.test`, name: "Test Harbourmaster", role: "harbourmaster", password: "correct horse battery", verified: true });
  return { officer, harbourmaster };
}

/** A valid form for a notice, with overrides; parsed exactly as the editor's action parses it. */
export function noticeForm(overrides: Record<string, string | string[]> = {}): Record<string, string | string[]> {
  return {
    title: "Dredging in the inner basin",
    generalType: "works",
    detailTypes: ["89"],
    restrictions: ["1", "27"],
    urgency: "routine",
    positionStatus: "reported",
    validFrom: "2026-12-01T08:00",
    validUntil: "2026-12-22T18:00",
    generalArea: "NORTH SEA",
    locality: "Kestrel Sound, inner basin",
    charts: "KS 101",
    body: "Dredging by a cutter-suction dredger. Keep clear.",
    "parts.0.kind": "area",
    "parts.0.crs": "EPSG:4230",
    "parts.0.positions": "55°12.36′N 003°02.20′E\n55°12.60′N 003°02.20′E\n55°12.60′N 003°02.68′E\n55°12.36′N 003°02.68′E",
    ...overrides,
  };
}

export function noticeInput(overrides: Record<string, string | string[]> = {}): NoticeInput {
  const r = parseNoticeForm(noticeForm(overrides), "Europe/London");
  if (!r.ok) throw new Error("test form invalid: " + JSON.stringify(r.errors));
  return r.data;
}
