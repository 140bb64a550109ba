// Shared by the staff editor routes: read the form, turn a notice into form values, and turn
// model refusals into field errors (values kept, precise status).
import { data } from "react-router";
import { toLocalInput } from "~/lib/notices/schema";
import type { NoticeView } from "~/lib/notices/types";
import { NoticeError } from "~/models/notice.server";
import { readForm } from "./form.server";

export type RawForm = Record<string, string | string[]>;

export async function readRawForm(request: Request): Promise<RawForm> {
  const form = await readForm(request);
  const raw: RawForm = {};
  for (const key of new Set(form.keys())) {
    const all = form.getAll(key).filter((v): v is string => typeof v === "string").map((v) => v.slice(0, 20_000));
    raw[key] = all.length > 1 || key === "detailTypes" || key === "restrictions" || key === "aidIds" ? all : (all[0] ?? "");
  }
  return raw;
}

export function noticeToValues(n: NoticeView, zone: string): RawForm {
  const v: RawForm = {
    title: n.title,
    generalType: n.generalType,
    detailTypes: n.detailTypes.map(String),
    restrictions: n.restrictions.map(String),
    urgency: n.urgency,
    positionStatus: n.positionStatus,
    validFrom: toLocalInput(n.validFrom, zone),
    validUntil: toLocalInput(n.validUntil, zone),
    untilFurtherNotice: n.validUntil ? "" : "on",
    generalArea: n.generalArea,
    locality: n.locality,
    charts: n.charts,
    body: n.body,
    relatedRefs: n.relatedRefs,
    aidIds: n.aids.map((a) => String(a.id)),
    reportIds: n.reportIds.map(String),
    acceptOutside: n.outsideBoundaryAccepted ? "on" : "",
  };
  n.parts.forEach((p, i) => {
    v[`parts.${i}.kind`] = p.kind;
    v[`parts.${i}.crs`] = p.crs;
    v[`parts.${i}.positions`] = p.positionsText;
    v[`parts.${i}.radiusNm`] = p.radiusNm == null ? "" : String(p.radiusNm);
  });
  return v;
}

/** A failed write: field errors and the submitted values, with 400 / 403 / 404 / 409. */
export function editorFailure(errors: Record<string, string>, values: RawForm, status = 400) {
  return data({ errors, values }, { status });
}

/** Runs a model call; a NoticeError becomes a field error response, anything else is rethrown. */
export async function withNoticeErrors<T>(values: RawForm, fn: () => Promise<T>): Promise<{ ok: true; value: T } | { ok: false; response: ReturnType<typeof editorFailure> }> {
  try {
    return { ok: true, value: await fn() };
  } catch (e) {
    if (e instanceof NoticeError) return { ok: false, response: editorFailure({ [e.field]: e.message }, values, e.status) };
    throw e;
  }
}
