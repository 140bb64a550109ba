// GET /staff/aids.csv — the register in the import format (round-trips through the import).
import { stringify } from "csv-stringify/sync";
import type { Route } from "./+types/staff.aids.csv";
import { AID_CSV_COLUMNS } from "~/lib/aids/schema";
import { listAids } from "~/models/aid.server";
import { getDefaultHarbour } from "~/models/harbour.server";
import { requireCapability } from "~/services/auth.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "aid:manage");
  const harbour = await getDefaultHarbour();
  const aids = harbour ? await listAids(harbour.id, { includeWithdrawn: true }) : [];
  const rows = aids.map((a) => [
    a.code,
    a.name,
    a.aidType,
    a.ialaCategory ?? "",
    a.ialaRegion,
    a.lightCharacteristic ?? "",
    a.chartedPositionText,
    a.chartedCrs,
    a.chainLengthM ?? "",
    a.depthM ?? "",
    a.swingRadiusM ?? "",
    a.status,
    a.remarks ?? "",
  ]);
  // Guard against spreadsheet formula injection: a cell starting with = + - @ is prefixed with '.
  const safe = rows.map((r) => r.map((c) => (typeof c === "string" && /^[=+\-@\t\r]/.test(c) ? `'${c}` : c)));
  const csv = stringify([[...AID_CSV_COLUMNS], ...safe]);
  return new Response("\uFEFF" + csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="aids-${harbour?.slug ?? "register"}.csv"`,
      "Cache-Control": "no-store",
    },
  });
}
