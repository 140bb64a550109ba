// The triage actions shared by the queue and the per-aid page: one zod schema, one place that
// turns a form into a status change or a drafted notice.
import { data } from "react-router";
import { z } from "zod";
import { AID_STATUSES } from "~/lib/aids/iala";
import { REPORT_STATUSES } from "~/lib/reports/schema";
import { changeReportStatus, reportReference, TriageError } from "~/models/report.server";
import type { User } from "~/models/user.server";
import { readForm } from "./form.server";
import { draftNoticeFromReports } from "./report-notice.server";
import { redirectWithToast } from "./session.server";

const id = z.coerce.number({ error: "Give a report number" }).int().positive({ error: "Give a report number" });

const statusSchema = z.object({
  intent: z.literal("status"),
  reportId: id,
  to: z.enum(REPORT_STATUSES, { error: "Choose what to do with the report" }),
  note: z.string().trim().max(1000, { error: "At most 1000 characters" }).optional(),
  duplicateOf: z.preprocess((v) => (typeof v === "string" ? v.replace(/^R-0*/i, "").trim() || undefined : v), id.optional()),
  aidStatus: z.enum(AID_STATUSES, { error: "Choose the aid's new status" }).optional(),
});
const draftSchema = z.object({
  intent: z.literal("draft-notice"),
  aidId: id,
  reportIds: z.preprocess((v) => (v === undefined ? [] : Array.isArray(v) ? v : [v]), z.array(id).min(1, { error: "Tick the reports to draft the notice from" }).max(50)),
});
const schema = z.discriminatedUnion("intent", [statusSchema, draftSchema], { error: "Unknown action" });

export type TriageActionData = { errors: Record<string, string>; reportId?: number };

export async function handleTriageAction(request: Request, user: User, back: string) {
  const form = await readForm(request);
  const raw: Record<string, unknown> = {};
  for (const key of new Set(form.keys())) {
    const all = form.getAll(key).filter((v) => typeof v === "string" && v !== "");
    raw[key] = key === "reportIds" ? all : all[0];
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success) {
    const i = parsed.error.issues[0]!;
    return data<TriageActionData>({ errors: { [String(i.path[0] ?? "form")]: i.message }, reportId: Number(raw.reportId) || undefined }, { status: 400 });
  }
  const v = parsed.data;
  try {
    if (v.intent === "draft-notice") {
      const { noticeId } = await draftNoticeFromReports(v.aidId, v.reportIds, user);
      return redirectWithToast(request, `/staff/notices/${noticeId}/edit`, { kind: "success", message: "Draft notice created from the reports: check it and send it for publication." });
    }
    await changeReportStatus(v.reportId, {
      to: v.to,
      actorUserId: user.id,
      note: v.note,
      duplicateOfId: v.duplicateOf ?? null,
      aidStatus: v.aidStatus ?? null,
      closedReason: "no_action",
    });
    return redirectWithToast(request, back, { kind: "success", message: `${reportReference(v.reportId)} is now ${v.to.replace("_", " ")}; the reporter has been e-mailed.` });
  } catch (e) {
    if (e instanceof TriageError) return data<TriageActionData>({ errors: { [e.field]: e.message }, reportId: v.intent === "status" ? v.reportId : undefined }, { status: e.field === "report" || e.field === "aid" ? 404 : 400 });
    const ne = e as { name?: string; message?: string; field?: string; status?: number };
    if (ne?.name === "NoticeError") return data<TriageActionData>({ errors: { reportIds: ne.message ?? "The notice could not be drafted" } }, { status: ne.status && ne.status < 500 ? ne.status : 400 });
    throw e;
  }
}
