// A new notice: officers and the harbourmaster draft; the harbourmaster may publish at once.
import { data, Link } from "react-router";
import type { Route } from "./+types/staff.notices.new";
import { aidMapFeature } from "~/components/notices/features";
import { NoticeEditor } from "~/components/notices/NoticeEditor";
import { Caution } from "~/components/Caution";
import { env } from "~/env.server";
import { can } from "~/lib/permissions";
import { crsOptions } from "~/lib/notices/position-table";
import { parseNoticeForm, toLocalInput } from "~/lib/notices/schema";
import { listAids } from "~/models/aid.server";
import { getDefaultHarbour } from "~/models/harbour.server";
import { createDraft, NoticeError, publishNotice } from "~/models/notice.server";
import { requireCapability } from "~/services/auth.server";
import { editorFailure, readRawForm, withNoticeErrors } from "~/services/notice-editor.server";
import { redirectWithToast } from "~/services/session.server";

export const meta: Route.MetaFunction = () => [{ title: "New notice · Staff · Tidewire" }];

async function context() {
  const harbour = await getDefaultHarbour();
  if (!harbour) throw data({ error: "No harbour is set up yet." }, { status: 409 });
  return harbour;
}

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "notice:draft");
  const harbour = await context();
  const aids = await listAids(harbour.id);
  return {
    defaults: {
      generalArea: harbour.generalArea,
      locality: harbour.name,
      validFrom: toLocalInput(new Date(), harbour.timeZone),
      untilFurtherNotice: "on",
      urgency: "routine",
      "parts.0.kind": "area",
      "parts.0.crs": harbour.defaultCrs,
    } as Record<string, string>,
    defaultCrs: harbour.defaultCrs,
    crsOptions: crsOptions(),
    aids: aids.map((a) => ({ id: a.id, code: a.code, name: a.name })),
    aidFeatures: aids.map(aidMapFeature),
    basemap: harbour.basemap,
    tileUrl: env().MAP_TILE_URL ?? null,
    zone: harbour.timeZone,
    canPublish: can(user.role, "notice:publish"),
  };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireCapability(request, "notice:draft");
  const harbour = await context();
  const values = await readRawForm(request);
  const parsed = parseNoticeForm(values, harbour.timeZone);
  if (!parsed.ok) return editorFailure(parsed.errors, values);
  const created = await withNoticeErrors(values, () => createDraft(harbour.id, parsed.data, user));
  if (!created.ok) return created.response;
  const draft = created.value;
  if (values.intent === "publish") {
    if (!can(user.role, "notice:publish")) {
      return redirectWithToast(request, `/staff/notices/${draft.id}/edit`, { kind: "info", message: "Draft saved. A harbourmaster publishes it." });
    }
    let published;
    try {
      published = await publishNotice(draft.id, draft.version, user, { acceptOutside: parsed.data.acceptOutside });
    } catch (e) {
      if (!(e instanceof NoticeError)) throw e;
      // The draft is saved: keep the editor open on it and say why it was not published.
      return redirectWithToast(request, `/staff/notices/${draft.id}/edit`, { kind: "error", message: `Draft saved, but not published: ${e.message}` });
    }
    return redirectWithToast(request, `/notices/${draft.id}`, { kind: "success", message: `Published ${published.seriesNumber}.` });
  }
  return redirectWithToast(request, `/staff/notices/${draft.id}/edit`, { kind: "success", message: "Draft saved." });
}

export default function NewNotice({ loaderData, actionData }: Route.ComponentProps) {
  const d = loaderData;
  const values = (actionData?.values as Record<string, string | string[]> | undefined) ?? d.defaults;
  return (
    <div className="space-y-4">
      <nav className="text-sm">
        <Link to="/staff/notices">Notices</Link> › New
      </nav>
      <h1 className="text-2xl font-bold">New notice</h1>
      <Caution compact />
      <NoticeEditor
        values={values}
        errors={(actionData?.errors as Record<string, string>) ?? {}}
        defaultCrs={d.defaultCrs}
        crsOptions={d.crsOptions}
        aids={d.aids}
        aidFeatures={d.aidFeatures}
        basemap={d.basemap}
        tileUrl={d.tileUrl}
        status="new"
        canPublish={d.canPublish}
        version={null}
      />
    </div>
  );
}
