// Discrepancy reports: storage, the triage queue, status changes with history and mail.
import { createHmac, timingSafeEqual } from "node:crypto";
import type { Knex } from "knex";
import { db as defaultDb, type Db } from "~/db.server";
import { env } from "~/env.server";
import { AID_STATUS_LABELS, type AidStatus } from "~/lib/aids/iala";
import type { AssessmentResponse, Verdict } from "~/lib/geo/assessment";
import { formatPosition } from "~/lib/geo/positions";
import { escapeHtml, mailLayout } from "~/lib/mail-layout";
import { formatSeriesNumber } from "~/lib/notices/vocabulary";
import { canTransition, REPORT_STATUS_LABELS, VERDICT_LABELS, type ReportStatus } from "~/lib/reports/schema";
import { setAidStatus } from "./aid.server";
import { enqueueMail } from "./outbox.server";
import { attachUploads } from "./photo.server";

export type Report = {
  id: number;
  reference: string;
  harbourId: number;
  aidId: number | null;
  aidCode: string | null;
  aidName: string | null;
  hazardDescription: string | null;
  method: "gnss" | "radar" | "compass";
  observation: Record<string, unknown>;
  observedAt: Date;
  remarks: string | null;
  reporterUserId: number | null;
  reporterEmail: string;
  reporterName: string | null;
  reporterVessel: string | null;
  status: ReportStatus;
  closedReason: "notice" | "no_action" | null;
  duplicateOfId: number | null;
  noticeId: number | null;
  observedLat: number;
  observedLon: number;
  uncertaintyM: number;
  verdict: Verdict | null;
  displacementM: number | null;
  displacementBearingDeg: number | null;
  assessment: AssessmentResponse | null;
  photoFlags: string[];
  createdAt: Date;
  updatedAt: Date;
};

export const reportReference = (id: number) => `R-${String(id).padStart(4, "0")}`;

function toReport(r: Record<string, any>): Report {
  return {
    id: r.id,
    reference: reportReference(r.id),
    harbourId: r.harbour_id,
    aidId: r.aid_id,
    aidCode: r.aid_code ?? null,
    aidName: r.aid_name ?? null,
    hazardDescription: r.hazard_description,
    method: r.observation_method,
    observation: JSON.parse(r.observation_json),
    observedAt: r.observed_at,
    remarks: r.remarks,
    reporterUserId: r.reporter_user_id,
    reporterEmail: r.reporter_email,
    reporterName: r.reporter_name,
    reporterVessel: r.reporter_vessel,
    status: r.status,
    closedReason: r.closed_reason,
    duplicateOfId: r.duplicate_of_id,
    noticeId: r.notice_id,
    observedLat: Number(r.observed_lat),
    observedLon: Number(r.observed_lon),
    uncertaintyM: Number(r.uncertainty_m),
    verdict: r.verdict,
    displacementM: r.displacement_m === null ? null : Number(r.displacement_m),
    displacementBearingDeg: r.displacement_bearing_deg === null ? null : Number(r.displacement_bearing_deg),
    assessment: r.assessment_json ? JSON.parse(r.assessment_json) : null,
    photoFlags: r.photo_flags_json ? JSON.parse(r.photo_flags_json) : [],
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

const base = (db: Db) =>
  db("reports as r").leftJoin("aids as a", "a.id", "r.aid_id").select("r.*", "a.code as aid_code", "a.name as aid_name");

// ---------------------------------------------------------------------------------------------
// Signed links for guests

/** HMAC of the report id with the session secret: the guest's key to follow the report. */
export function reportLinkKey(id: number): string {
  return createHmac("sha256", env().SESSION_SECRET).update(`report-link:${id}`).digest("base64url");
}

export function verifyReportLinkKey(id: number, key: string | null | undefined): boolean {
  if (!key) return false;
  const want = Buffer.from(reportLinkKey(id));
  const got = Buffer.from(key);
  return want.length === got.length && timingSafeEqual(want, got);
}

export function reportFollowUrl(id: number): string {
  return new URL(`/reports/${id}?key=${reportLinkKey(id)}`, env().APP_URL).toString();
}

// ---------------------------------------------------------------------------------------------
// Creating

export type NewReport = {
  harbourId: number;
  aidId: number | null;
  aidLabel: string | null; // "KS3 starboard-hand buoy"
  hazardDescription: string | null;
  method: "gnss" | "radar" | "compass";
  observation: Record<string, unknown>;
  observedAt: Date;
  remarks: string | null;
  reporterUserId: number | null;
  reporterEmail: string;
  reporterName: string | null;
  reporterVessel: string | null;
  observedLat: number;
  observedLon: number;
  uncertaintyM: number;
  assessment: AssessmentResponse | null;
  photoFlags: string[];
  photoUploadIds: string[];
};

/** Writes the report, attaches its photos, records the event and queues the confirmation: one transaction. */
export async function createReport(r: NewReport, db = defaultDb): Promise<number> {
  return db.transaction(async (trx) => {
    const [id] = await trx("reports").insert({
      harbour_id: r.harbourId,
      aid_id: r.aidId,
      hazard_description: r.hazardDescription,
      observation_method: r.method,
      observation_json: JSON.stringify(r.observation),
      observed_at: r.observedAt,
      remarks: r.remarks,
      reporter_user_id: r.reporterUserId,
      reporter_email: r.reporterEmail,
      reporter_name: r.reporterName,
      reporter_vessel: r.reporterVessel,
      status: "new",
      observed_lat: r.observedLat,
      observed_lon: r.observedLon,
      uncertainty_m: r.uncertaintyM,
      verdict: r.assessment?.verdict ?? null,
      displacement_m: r.assessment?.displacement.distanceM ?? null,
      displacement_bearing_deg: r.assessment?.displacement.bearingTrueDeg ?? null,
      assessment_json: r.assessment ? JSON.stringify(r.assessment) : null,
      photo_flags_json: r.photoFlags.length ? JSON.stringify(r.photoFlags) : null,
    });
    const reportId = id as number;
    await attachUploads(reportId, r.photoUploadIds, trx);
    await trx("report_events").insert({ report_id: reportId, from_status: null, to_status: "new", actor_user_id: r.reporterUserId, note: "Report received" });
    await enqueueMail(receivedMail(reportId, r), trx);
    return reportId;
  });
}

function what(r: { aidLabel: string | null; hazardDescription: string | null }) {
  return r.aidLabel ?? (r.hazardDescription ? `uncharted hazard: ${r.hazardDescription.slice(0, 60)}` : "report");
}

function receivedMail(id: number, r: NewReport) {
  const ref = reportReference(id);
  const link = reportFollowUrl(id);
  const pos = formatPosition(r.observedLat, r.observedLon, "ddm", { decimals: 3 });
  const verdict = r.assessment ? `${VERDICT_LABELS[r.assessment.verdict]} — ${r.assessment.explanation}` : "No assessment (uncharted hazard).";
  const text = [
    `Thank you${r.reporterName ? `, ${r.reporterName}` : ""}. We have received your report ${ref} about ${what(r)}.`,
    "",
    `Observed position (WGS 84): ${pos}, ±${Math.round(r.uncertaintyM)} m (95%)`,
    `First assessment: ${verdict}`,
    "",
    "The harbour office will look at it and you will get an e-mail at each step.",
    `Follow your report: ${link}`,
    "",
    "Tidewire informs; it does not replace official charts, official notices to mariners or a proper lookout.",
  ].join("\n");
  const html = mailLayout(
    `Report ${ref} received`,
    `<p>Thank you${r.reporterName ? `, ${escapeHtml(r.reporterName)}` : ""}. We have received your report <strong>${ref}</strong> about ${escapeHtml(what(r))}.</p>
<p>Observed position (WGS 84): <strong>${escapeHtml(pos)}</strong>, ±${Math.round(r.uncertaintyM)} m (95%)<br>First assessment: ${escapeHtml(verdict)}</p>
<p>The harbour office will look at it and you will get an e-mail at each step.</p>
<p><a href="${escapeHtml(link)}" style="color:#0b4f6c">Follow your report</a></p>`,
  );
  return { idempotencyKey: `report:${id}:received`, kind: "report_received", to: r.reporterEmail, subject: `Report ${ref} received: ${what(r)}`, text, html };
}

// ---------------------------------------------------------------------------------------------
// Reading

export async function getReport(id: number, db: Db = defaultDb): Promise<Report | null> {
  const r = await base(db).where("r.id", id).first();
  return r ? toReport(r) : null;
}

export async function getReports(ids: number[], db: Db = defaultDb): Promise<Report[]> {
  if (ids.length === 0) return [];
  return (await base(db).whereIn("r.id", ids).orderBy("r.id")).map(toReport);
}

export async function listReportsOfUser(userId: number, db: Db = defaultDb): Promise<Report[]> {
  return (await base(db).where("r.reporter_user_id", userId).orderBy("r.created_at", "desc").limit(200)).map(toReport);
}

const VERDICT_ORDER = "FIELD(r.verdict, 'off_station', 'inconclusive', 'within_swing_circle')";

/**
 * The triage queue: open reports, most serious verdict first (off station, uncharted hazards,
 * inconclusive, within swing circle), oldest first within each.
 */
export async function triageQueue(opts: { includeClosed?: boolean } = {}, db: Db = defaultDb): Promise<Report[]> {
  const q = base(db);
  if (!opts.includeClosed) q.whereNotIn("r.status", ["closed", "duplicate", "not_confirmed"]);
  q.orderByRaw(`CASE WHEN r.verdict IS NULL THEN 1.5 ELSE ${VERDICT_ORDER} END`).orderBy("r.created_at", "asc").orderBy("r.id", "asc").limit(500);
  return (await q).map(toReport);
}

export async function reportsOfAid(aidId: number, db: Db = defaultDb): Promise<Report[]> {
  return (await base(db).where("r.aid_id", aidId).orderBy("r.observed_at", "desc").limit(200)).map(toReport);
}

export type ReportEvent = { id: number; fromStatus: string | null; toStatus: string; note: string | null; actorName: string | null; createdAt: Date; duplicateOfId: number | null; noticeId: number | null };

export async function reportEvents(reportId: number, db: Db = defaultDb): Promise<ReportEvent[]> {
  const rows = await db("report_events as e")
    .leftJoin("users as u", "u.id", "e.actor_user_id")
    .select("e.*", "u.name as actor_name")
    .where("e.report_id", reportId)
    .orderBy([{ column: "e.created_at" }, { column: "e.id" }]);
  return rows.map((e: Record<string, any>) => ({
    id: e.id,
    fromStatus: e.from_status,
    toStatus: e.to_status,
    note: e.note,
    actorName: e.actor_name,
    createdAt: e.created_at,
    duplicateOfId: e.duplicate_of_id,
    noticeId: e.notice_id,
  }));
}

// ---------------------------------------------------------------------------------------------
// Triage

export class TriageError extends Error {
  constructor(
    message: string,
    readonly field = "status",
  ) {
    super(message);
  }
}

export type StatusChange = {
  to: ReportStatus;
  actorUserId: number | null;
  note?: string | null;
  duplicateOfId?: number | null;
  /** On confirm: the aid's new status (default off station). */
  aidStatus?: AidStatus | null;
  closedReason?: "notice" | "no_action";
  noticeId?: number | null;
};

const STATUS_MAIL_LINES: Record<ReportStatus, string> = {
  new: "",
  acknowledged: "The harbour office has received your report and is looking into it.",
  confirmed: "The harbour office has confirmed what you reported. Thank you: it helps keep everyone safe.",
  not_confirmed: "The harbour office could not confirm what you reported (for example, a check found the mark in position).",
  duplicate: "Your report describes the same thing as another report, which is being handled; yours is kept with it.",
  closed: "Your report is now closed.",
};

/** One status change: the report row, a report_events row, the reporter's mail and (on confirm) the aid's status. */
export async function changeReportStatus(reportId: number, change: StatusChange, db = defaultDb): Promise<void> {
  await db.transaction(async (trx) => {
    await applyStatusChange(reportId, change, trx);
  });
}

export async function applyStatusChange(reportId: number, change: StatusChange, trx: Knex.Transaction): Promise<void> {
  const row = await trx("reports").where({ id: reportId }).forUpdate().first();
  if (!row) throw new TriageError("No such report", "report");
  const from = row.status as ReportStatus;
  if (!canTransition(from, change.to)) {
    throw new TriageError(`A report that is ${REPORT_STATUS_LABELS[from].toLowerCase()} cannot become ${REPORT_STATUS_LABELS[change.to].toLowerCase()}`);
  }
  const update: Record<string, unknown> = { status: change.to, updated_at: trx.fn.now(3) };
  let note = change.note?.trim() || null;
  if (change.to === "duplicate") {
    const dupId = change.duplicateOfId;
    if (!dupId || dupId === reportId) throw new TriageError("Choose the report this one duplicates", "duplicateOfId");
    const other = await trx("reports").select("id", "status").where({ id: dupId }).first();
    if (!other) throw new TriageError(`There is no report ${reportReference(dupId)}`, "duplicateOfId");
    if (other.status === "duplicate") throw new TriageError(`${reportReference(dupId)} is itself a duplicate: choose the original`, "duplicateOfId");
    update.duplicate_of_id = dupId;
    note = note ?? `Duplicate of ${reportReference(dupId)}`;
  }
  if (change.to === "closed") {
    update.closed_reason = change.closedReason ?? "no_action";
    if (change.noticeId) update.notice_id = change.noticeId;
  }
  await trx("reports").where({ id: reportId }).update(update);
  const [eventId] = await trx("report_events").insert({
    report_id: reportId,
    from_status: from,
    to_status: change.to,
    note: note?.slice(0, 1000) ?? null,
    actor_user_id: change.actorUserId,
    duplicate_of_id: change.duplicateOfId ?? null,
    notice_id: change.noticeId ?? null,
  });
  if (change.to === "confirmed" && row.aid_id) {
    const status = change.aidStatus ?? "off_station";
    await setAidStatus(row.aid_id, status, { reason: `${reportReference(reportId)} confirmed${note ? `: ${note}` : ""}`, userId: change.actorUserId, reportId }, trx);
  }
  const aid = row.aid_id ? await trx("aids").select("code", "name").where({ id: row.aid_id }).first() : null;
  const subjectWhat = aid ? `${aid.code}` : "uncharted hazard";
  const ref = reportReference(reportId);
  const link = reportFollowUrl(reportId);
  const lines = [
    `Your report ${ref} (${aid ? aid.name : row.hazard_description}) is now: ${REPORT_STATUS_LABELS[change.to]}.`,
    "",
    STATUS_MAIL_LINES[change.to],
    change.to === "closed" ? (change.closedReason === "notice" ? "A navigational warning has been published about it." : "No further action is needed.") : "",
    change.to === "confirmed" && row.aid_id ? `The aid is now recorded as ${AID_STATUS_LABELS[change.aidStatus ?? "off_station"].toLowerCase()}.` : "",
    note && change.to !== "duplicate" ? `Note from the harbour office: ${note}` : "",
    "",
    `Follow your report: ${link}`,
  ].filter((l, i, a) => l !== "" || (a[i - 1] ?? "") !== "");
  await enqueueMail(
    {
      idempotencyKey: `report:${reportId}:event:${eventId}`,
      kind: "report_status",
      to: row.reporter_email,
      subject: `Report ${ref} (${subjectWhat}): ${REPORT_STATUS_LABELS[change.to].toLowerCase()}`,
      text: lines.join("\n"),
      html: mailLayout(
        `Report ${ref}: ${REPORT_STATUS_LABELS[change.to]}`,
        lines
          .filter(Boolean)
          .slice(0, -1)
          .map((l) => `<p>${escapeHtml(l)}</p>`)
          .join("\n") + `<p><a href="${escapeHtml(link)}" style="color:#0b4f6c">Follow your report</a></p>`,
      ),
    },
    trx,
  );
}

/** Links reports to a drafted notice (no status change: they close when the notice is published). */
export async function linkReportsToNotice(reportIds: number[], noticeId: number, actorUserId: number, trx: Knex.Transaction): Promise<void> {
  for (const id of reportIds) {
    await trx("reports").where({ id }).update({ notice_id: noticeId, updated_at: trx.fn.now(3) });
    await trx("report_events").insert({ report_id: id, from_status: null, to_status: "draft_notice", note: "A notice was drafted from this report", actor_user_id: actorUserId, notice_id: noticeId });
  }
}

/**
 * For the notices transaction (e.g. from onNoticeEvent on "published"): closes the reports
 * linked to the notice at once, with the same steps as closeReportsOfPublishedNotices (an open
 * report is confirmed first). Returns how many were closed.
 */
export async function closeReportsForNotice(noticeId: number, actorUserId: number | null, trx: Knex.Transaction): Promise<number> {
  const notice = await trx("notices").select("series_code", "year", "number", "published_by").where({ id: noticeId }).first();
  actorUserId ??= notice?.published_by ?? null;
  const ref = notice?.number ? formatSeriesNumber(notice.series_code, notice.year, notice.number) : `notice ${noticeId}`;
  const viaList = (await trx("notice_reports").where({ notice_id: noticeId }).pluck("report_id")) as number[];
  const viaDraft = (await trx("reports").where({ notice_id: noticeId }).pluck("id")) as number[];
  let n = 0;
  for (const id of [...new Set([...viaList, ...viaDraft])]) {
    const r = await trx("reports").select("status").where({ id }).forUpdate().first();
    if (!r || r.status === "closed" || r.status === "duplicate") continue;
    if (r.status === "new" || r.status === "acknowledged") {
      await applyStatusChange(id, { to: "confirmed", actorUserId, note: `Confirmed by navigational warning ${ref}`, aidStatus: "off_station" }, trx);
    }
    await applyStatusChange(id, { to: "closed", actorUserId, closedReason: "notice", noticeId, note: `Navigational warning ${ref} published` }, trx);
    n++;
  }
  return n;
}

/**
 * Reports linked to a notice that has since been published are closed "by a notice": an open
 * report (new, acknowledged) is first confirmed — the harbour published a warning about it —
 * then closed, each step with its event and mail. Run by the worker (and the triage pages), so
 * it needs no hook inside the notices model's transaction.
 */
export async function closeReportsOfPublishedNotices(db = defaultDb): Promise<number> {
  type Row = { id: number; status: ReportStatus; notice_id: number; series_code: string; year: number; number: number; published_by: number | null };
  const cols = ["r.id", "r.status", "n.id as notice_id", "n.series_code", "n.year", "n.number", "n.published_by"];
  // Linked through the notice's own list (notice_reports) or by the draft made from the report.
  const viaList = (await db("notice_reports as nr")
    .join("reports as r", "r.id", "nr.report_id")
    .join("notices as n", "n.id", "nr.notice_id")
    .whereNotNull("n.published_at")
    .whereNotIn("r.status", ["closed", "duplicate"])
    .select(cols)
    .limit(100)) as Row[];
  const viaDraft = (await db("reports as r")
    .join("notices as n", "n.id", "r.notice_id")
    .whereNotNull("n.published_at")
    .whereNotIn("r.status", ["closed", "duplicate"])
    .select(cols)
    .limit(100)) as Row[];
  const rows = [...new Map([...viaList, ...viaDraft].map((r) => [r.id, r])).values()];
  let n = 0;
  for (const r of rows) {
    const ref = formatSeriesNumber(r.series_code, r.year, r.number);
    await db.transaction(async (trx) => {
      const fresh = await trx("reports").select("status").where({ id: r.id }).forUpdate().first();
      if (!fresh || fresh.status === "closed" || fresh.status === "duplicate") return;
      if (fresh.status === "new" || fresh.status === "acknowledged") {
        await applyStatusChange(r.id, { to: "confirmed", actorUserId: r.published_by, note: `Confirmed by navigational warning ${ref}`, aidStatus: "off_station" }, trx);
      }
      await applyStatusChange(r.id, { to: "closed", actorUserId: r.published_by, closedReason: "notice", noticeId: r.notice_id, note: `Navigational warning ${ref} published` }, trx);
      n++;
    });
  }
  return n;
}
