// "Draft a notice from these reports": a draft local warning prefilled from the combined
// estimate of an aid's reports, through the notices model (createDraft), linked to the reports.
import { db } from "~/db.server";
import { parseLightCharacteristic } from "~/lib/aids/light";
import { assess, type AssessmentResponse } from "~/lib/geo/assessment";
import { formatPosition } from "~/lib/geo/positions";
import type { NoticeInput } from "~/lib/notices/schema";
import { assessmentInputFor } from "~/lib/reports/schema";
import { getAid, type Aid } from "~/models/aid.server";
import { getHarbourById } from "~/models/harbour.server";
import { createDraft, partFromEntered } from "~/models/notice.server";
import { getReports, linkReportsToNotice, reportReference, TriageError, type Report } from "~/models/report.server";
import type { User } from "~/models/user.server";

/** S-124 navwarnTypeDetails "buoy off position" (feature catalogue 1.5; ../shared/TRADE.md). */
export const DETAIL_BUOY_OFF_POSITION = 51;

const COMPASS_POINTS = ["N", "NNE", "NE", "ENE", "E", "ESE", "SE", "SSE", "S", "SSW", "SW", "WSW", "W", "WNW", "NW", "NNW"];
const point16 = (deg: number) => COMPASS_POINTS[Math.round(((deg % 360) + 360) % 360 / 22.5) % 16]!;

/** Combined assessment of the given reports of one aid (all observations together). */
export function combinedAssessment(aid: Aid, reports: Report[]): AssessmentResponse | null {
  if (reports.length === 0) return null;
  try {
    return assess(assessmentInputFor(aid, reports.map((r) => r.observation)));
  } catch {
    return null;
  }
}

/**
 * The notice text in the trade's order and wording (MSC.1/Circ.1310 §5.5: locality, subject,
 * positions, remarks). "REPORTED", not "LOCATED": the position is not confirmed by survey.
 */
export function noticeTextFor(aid: Aid, a: AssessmentResponse, reports: Report[]): { title: string; body: string } {
  const light = aid.lightCharacteristic ? parseLightCharacteristic(aid.lightCharacteristic) : null;
  const charted = formatPosition(a.charted.lat, a.charted.lon, "broadcast");
  const reported = formatPosition(a.estimate.lat, a.estimate.lon, "broadcast");
  const name = aid.name.toUpperCase();
  const lightText = light?.ok ? ` ${light.value.text}` : "";
  const distance = `${a.displacement.distanceNm.toFixed(2)} M ${point16(a.displacement.bearingTrueDeg)}`;
  const refs = reports.map((r) => reportReference(r.id)).join(", ");
  const body = [
    `${name}${lightText} REPORTED OFF POSITION.`,
    `CHARTED POSITION ${charted}${aid.chartedCrs !== "EPSG:4326" ? ` (CHARTED ON ${aid.chartedCrs}, GIVEN HERE IN WGS 84)` : ""}.`,
    `REPORTED IN ${reported}, ${distance} OF CHARTED POSITION, UNCERTAINTY ${Math.round(a.combinedUncertaintyM)} METRES.`,
    "MARINERS ARE ADVISED TO NAVIGATE WITH CAUTION.",
    "",
    `From ${reports.length} report${reports.length === 1 ? "" : "s"} (${refs}); ${a.explanation}`,
  ].join("\n");
  return { title: `${aid.code} ${aid.aidType} off position`, body };
}

export async function draftNoticeFromReports(aidId: number, reportIds: number[], user: User): Promise<{ noticeId: number }> {
  const aid = await getAid(aidId);
  if (!aid) throw new TriageError("No such aid", "aid");
  const reports = (await getReports(reportIds)).filter((r) => r.aidId === aidId && r.status !== "duplicate");
  if (reports.length === 0) throw new TriageError("Choose at least one report of this aid to draft the notice from", "reportIds");
  const a = combinedAssessment(aid, reports);
  if (!a) throw new TriageError("These reports cannot be combined into an estimate", "reportIds");
  const harbour = await getHarbourById(aid.harbourId);
  if (!harbour) throw new TriageError("The aid's harbour no longer exists", "aid");
  const { title, body } = noticeTextFor(aid, a, reports);
  const positionsText = formatPosition(a.estimate.lat, a.estimate.lon, "ddm", { decimals: 2 });
  const input: NoticeInput = {
    title,
    generalType: "aids_to_navigation_changes",
    detailTypes: [DETAIL_BUOY_OFF_POSITION],
    restrictions: [],
    urgency: "urgent",
    positionStatus: "reported",
    validFrom: new Date(),
    validUntil: null,
    generalArea: harbour.generalArea,
    locality: `${harbour.name}, ${aid.code}`,
    charts: "",
    body,
    relatedRefs: "",
    aidIds: [aid.id],
    reportIds: reports.map((r) => r.id),
    acceptOutside: false,
    parts: [partFromEntered("point", "EPSG:4326", positionsText, [[a.estimate.lon, a.estimate.lat]])],
  };
  return db.transaction(async (trx) => {
    const notice = await createDraft(harbour.id, input, { id: user.id, role: user.role }, {}, trx);
    await linkReportsToNotice(
      reports.map((r) => r.id),
      notice.id,
      user.id,
      trx,
    );
    return { noticeId: notice.id };
  });
}
