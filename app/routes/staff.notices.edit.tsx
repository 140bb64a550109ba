// Edit a draft (officer or harbourmaster), publish it, or — for a notice in force — amend,
// cancel with a reason, or supersede it (harbourmaster). A preview shows the notice exactly as
// the public page will.
import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/staff.notices.edit";
import { Caution } from "~/components/Caution";
import { FormError, TextArea } from "~/components/forms";
import { aidMapFeature } from "~/components/notices/features";
import { NoticeDetail } from "~/components/notices/NoticeDetail";
import { renderBroadcast } from "~/lib/notices/broadcast";
import { NoticeEditor } from "~/components/notices/NoticeEditor";
import { env } from "~/env.server";
import { can } from "~/lib/permissions";
import { crsLabel, crsOptions, positionRows } from "~/lib/notices/position-table";
import { parseNoticeForm } from "~/lib/notices/schema";
import { listAids } from "~/models/aid.server";
import { getDefaultHarbour } from "~/models/harbour.server";
import { cancelNotice, createSupersedingDraft, getNotice, publishNotice, updateNotice } from "~/models/notice.server";
import { requireCapability } from "~/services/auth.server";
import { editorFailure, noticeToValues, readRawForm, withNoticeErrors } from "~/services/notice-editor.server";
import { redirectWithToast } from "~/services/session.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.notice.seriesNumber ?? "Draft"} · Edit · Tidewire` }];

async function load(id: string) {
  const notice = /^\d{1,10}$/.test(id) ? await getNotice(Number(id)) : null;
  if (!notice) throw data({ error: "There is no such notice." }, { status: 404 });
  const harbour = await getDefaultHarbour();
  if (!harbour) throw data({ error: "No harbour is set up yet." }, { status: 409 });
  return { notice, harbour };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "notice:draft");
  const { notice, harbour } = await load(params.id);
  if (notice.effectiveStatus !== "draft" && notice.effectiveStatus !== "in_force") throw redirect(`/notices/${notice.id}`);
  const aids = await listAids(harbour.id);
  return {
    notice,
    values: noticeToValues(notice, harbour.timeZone),
    zone: harbour.timeZone,
    defaultCrs: harbour.defaultCrs,
    crsOptions: crsOptions(),
    aids: aids.map((a) => ({ id: a.id, code: a.code, name: a.name })),
    aidFeatures: aids.map(aidMapFeature),
    basemap: harbour.basemap,
    tileUrl: env().MAP_TILE_URL ?? null,
    positions: positionRows(notice, null),
    broadcast: renderBroadcast(notice),
    crsLabels: Object.fromEntries(notice.parts.map((p) => [p.crs, crsLabel(p.crs)])),
    canPublish: can(user.role, "notice:publish"),
    canEdit: notice.effectiveStatus === "draft" || can(user.role, "notice:publish"),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "notice:draft");
  const { notice, harbour } = await load(params.id);
  const values = await readRawForm(request);
  const intent = String(values.intent ?? "save");
  const version = Number(values.version);
  if (!Number.isInteger(version) || version < 1) return editorFailure({ version: "The form is missing its version: reload the page." }, values);

  if (intent === "cancel" || intent === "supersede") {
    if (!can(user.role, "notice:publish")) return editorFailure({ form: "Only the harbourmaster can do that." }, values, 403);
    if (intent === "cancel") {
      const r = await withNoticeErrors(values, () => cancelNotice(notice.id, version, String(values.reason ?? ""), user));
      if (!r.ok) return r.response;
      return redirectWithToast(request, `/notices/${notice.id}`, { kind: "success", message: `${notice.seriesNumber} cancelled.` });
    }
    const r = await withNoticeErrors(values, () => createSupersedingDraft(notice.id, user));
    if (!r.ok) return r.response;
    return redirectWithToast(request, `/staff/notices/${r.value.id}/edit`, { kind: "info", message: `Superseding draft started: publishing it cancels ${notice.seriesNumber}.` });
  }

  const parsed = parseNoticeForm(values, harbour.timeZone);
  if (!parsed.ok) return editorFailure(parsed.errors, values);
  const saved = await withNoticeErrors(values, () => updateNotice(notice.id, version, parsed.data, user));
  if (!saved.ok) return saved.response;
  if (intent === "publish" && saved.value.status === "draft") {
    if (!can(user.role, "notice:publish")) return editorFailure({ form: "Draft saved. Only the harbourmaster can publish." }, { ...values, version: String(saved.value.version) }, 403);
    const pub = await withNoticeErrors({ ...values, version: String(saved.value.version) }, () => publishNotice(notice.id, saved.value.version, user, { acceptOutside: parsed.data.acceptOutside }));
    if (!pub.ok) return pub.response;
    return redirectWithToast(request, `/notices/${notice.id}`, { kind: "success", message: `Published ${pub.value.seriesNumber}.` });
  }
  return redirectWithToast(request, `/staff/notices/${notice.id}/edit`, { kind: "success", message: saved.value.status === "in_force" ? `Amendment to ${saved.value.seriesNumber} published.` : "Draft saved." });
}

export default function EditNotice({ loaderData, actionData }: Route.ComponentProps) {
  const d = loaderData;
  const n = d.notice;
  const errors = (actionData?.errors as Record<string, string>) ?? {};
  const values = (actionData?.values as Record<string, string | string[]> | undefined) ?? d.values;
  const busy = useNavigation().state === "submitting";
  const inForce = n.effectiveStatus === "in_force";
  return (
    <div className="space-y-6">
      <nav className="text-sm">
        <Link to="/staff/notices">Notices</Link> › {n.seriesNumber ?? "Draft"}
      </nav>
      <h1 className="text-2xl font-bold">
        {inForce ? `Amend ${n.seriesNumber}` : "Edit draft"}: {n.title}
      </h1>
      {n.supersedesNoticeId ? (
        <p className="rounded bg-tide-light px-3 py-2">
          Publishing this draft cancels and supersedes <Link to={`/notices/${n.supersedesNoticeId}`}>{n.supersedesSeriesNumber}</Link>.
        </p>
      ) : null}
      <Caution compact />
      {d.canEdit ? (
        <NoticeEditor
          values={{ ...values, version: undefined }}
          errors={errors}
          defaultCrs={d.defaultCrs}
          crsOptions={d.crsOptions}
          aids={d.aids}
          aidFeatures={d.aidFeatures}
          basemap={d.basemap}
          tileUrl={d.tileUrl}
          status={inForce ? "in_force" : "draft"}
          canPublish={d.canPublish}
          version={Number(values.version ?? n.version) || n.version}
        />
      ) : (
        <p className="card">Only the harbourmaster can amend a notice in force.</p>
      )}
      {inForce && d.canPublish ? (
        <div className="grid gap-4 md:grid-cols-2">
          <Form method="post" className="card space-y-3" aria-labelledby="cancel-heading">
            <h2 id="cancel-heading" className="text-lg font-bold">
              Cancel this notice
            </h2>
            <FormError error={errors.version && values.intent === "cancel" ? errors.version : undefined} />
            <input type="hidden" name="version" value={n.version} />
            <TextArea label="Reason (published with the cancellation)" name="reason" rows={2} defaultValue={typeof values.reason === "string" ? values.reason : ""} error={errors.reason} />
            <button type="submit" name="intent" value="cancel" className="btn-danger" disabled={busy}>
              Cancel notice
            </button>
          </Form>
          <Form method="post" className="card space-y-3" aria-labelledby="supersede-heading">
            <h2 id="supersede-heading" className="text-lg font-bold">
              Supersede
            </h2>
            <p className="text-sm">Start a corrected notice from this one. When you publish it, this notice is cancelled and points to the new one.</p>
            <input type="hidden" name="version" value={n.version} />
            <button type="submit" name="intent" value="supersede" className="btn-secondary" disabled={busy}>
              Start a superseding notice
            </button>
          </Form>
        </div>
      ) : null}
      <section aria-labelledby="preview-heading" className="space-y-3 border-t border-mist pt-4">
        <h2 id="preview-heading" className="text-xl font-bold">
          Preview (last saved version, as the public will see it)
        </h2>
        <div className="rounded-lg border-2 border-dashed border-mist p-4">
          <NoticeDetail notice={n} zone={d.zone} positions={d.positions} crsLabels={d.crsLabels} chosenCrsLabel={null} broadcast={d.broadcast} />
        </div>
      </section>
    </div>
  );
}
