import { data, Form, Link, redirect } from "react-router";
import type { Route } from "./+types/staff.aids.edit";
import { Caution } from "~/components/Caution";
import { Field, FormError, Select, TextArea } from "~/components/forms";
import { AID_STATUS_LABELS, AID_STATUSES, AID_TYPE_LABELS, AID_TYPES, characteristicWarning, defaultCharacteristics, IALA_CATEGORIES, IALA_CATEGORY_LABELS } from "~/lib/aids/iala";
import { aidInputSchema } from "~/lib/aids/schema";
import { listCrs } from "~/lib/geo/crs-registry";
import { formatPosition } from "~/lib/geo/positions";
import { formatInZone } from "~/lib/reports/time";
import { AidCodeTakenError, aidLight, aidStatusHistory, aidSwingRadiusM, createAid, getAid, updateAid } from "~/models/aid.server";
import { getDefaultHarbour } from "~/models/harbour.server";
import { requireCapability } from "~/services/auth.server";
import { badRequest, formValues, parseFormWith, readForm } from "~/services/form.server";
import { redirectWithToast } from "~/services/session.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.aid ? data.aid.code : "New aid"} · Aids register · Tidewire` }];

const CRS_OPTIONS = listCrs({ includeUtm: false }).map((c) => ({ value: c.id, label: `${c.id} · ${c.label}` }));

async function load(params: { aidId: string }) {
  if (params.aidId === "new") return null;
  if (!/^\d{1,9}$/.test(params.aidId)) throw data({ error: "No such aid" }, { status: 404 });
  const aid = await getAid(Number(params.aidId));
  if (!aid) throw data({ error: "No such aid" }, { status: 404 });
  return aid;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "aid:manage");
  const aid = await load(params);
  const harbour = await getDefaultHarbour();
  const history = aid ? await aidStatusHistory(aid.id) : [];
  const light = aid ? aidLight(aid) : null;
  return {
    timeZone: harbour?.timeZone ?? "Europe/London",
    defaultCrs: harbour?.defaultCrs ?? "EPSG:4326",
    aid: aid
      ? {
          id: aid.id,
          code: aid.code,
          values: {
            code: aid.code,
            name: aid.name,
            aid_type: aid.aidType,
            iala_category: aid.ialaCategory ?? "",
            iala_region: aid.ialaRegion,
            light_characteristic: aid.lightCharacteristic ?? "",
            charted_position: aid.chartedPositionText,
            charted_crs: aid.chartedCrs,
            chain_length_m: aid.chainLengthM?.toString() ?? "",
            depth_m: aid.depthM?.toString() ?? "",
            swing_radius_m: aid.swingRadiusM?.toString() ?? "",
            status: aid.status,
            remarks: aid.remarks ?? "",
          } as Record<string, string>,
          wgs84: formatPosition(aid.lat, aid.lon, "ddm", { decimals: 3 }),
          swingRadiusM: aidSwingRadiusM(aid),
          lightDescription: light?.description ?? null,
          lightWarning: characteristicWarning(aid.ialaCategory, aid.ialaRegion, light),
        }
      : null,
    history: history.map((h) => ({ ...h, changedAt: h.changedAt.toISOString() })),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "aid:manage");
  const existing = await load(params);
  const harbour = await getDefaultHarbour();
  if (!harbour) throw data({ error: "No harbour is set up yet." }, { status: 404 });
  const form = await readForm(request);
  const parsed = parseFormWith(aidInputSchema, form);
  if (!parsed.ok) return badRequest(parsed.failure);
  const reason = String(form.get("status_reason") ?? "").trim().slice(0, 500) || null;
  try {
    if (existing) {
      await updateAid(existing.id, parsed.data, user.id, reason);
      return redirectWithToast(request, `/staff/aids/${existing.id}`, { kind: "success", message: `${parsed.data.code} saved.${parsed.data.lightWarning ? " Check: " + parsed.data.lightWarning : ""}` });
    }
    const id = await createAid(harbour.id, parsed.data, user.id);
    return redirectWithToast(request, `/staff/aids/${id}`, { kind: "success", message: `${parsed.data.code} added to the register.` });
  } catch (e) {
    if (e instanceof AidCodeTakenError) return badRequest({ errors: { code: e.message }, values: formValues(form) });
    throw e;
  }
}

export default function AidEdit({ loaderData, actionData }: Route.ComponentProps) {
  const { aid, history, timeZone, defaultCrs } = loaderData;
  const failure = actionData as { errors: Record<string, string | undefined>; values: Record<string, string> } | undefined;
  const v: Record<string, string> = failure?.values ?? aid?.values ?? { iala_region: "A", charted_crs: defaultCrs, status: "operating", aid_type: "buoy" };
  const e = failure?.errors ?? {};
  const suggestions = v.iala_category && (IALA_CATEGORIES as readonly string[]).includes(v.iala_category) ? defaultCharacteristics(v.iala_category as (typeof IALA_CATEGORIES)[number], (v.iala_region as "A" | "B") || "A") : [];
  return (
    <div className="mx-auto max-w-4xl">
      <p className="text-sm">
        <Link to="/staff/aids" className="underline">
          ← Aids register
        </Link>
      </p>
      <h1 className="mt-1 text-2xl font-bold">{aid ? `${aid.code}` : "Add an aid"}</h1>
      <div className="mt-3">
        <Caution compact />
      </div>
      {aid ? (
        <p className="mt-3 text-sm">
          WGS 84: <span className="position">{aid.wgs84}</span> · swing radius {aid.swingRadiusM === null ? "not known" : `${aid.swingRadiusM.toFixed(1)} m`}
          {aid.lightDescription ? ` · light: ${aid.lightDescription}` : ""} ·{" "}
          <Link to={`/staff/reports/aid/${aid.id}`} className="underline">
            reports of this aid
          </Link>
        </p>
      ) : null}
      {aid?.lightWarning ? <p className="mt-2 rounded-md bg-warn-light px-3 py-2 text-sm">{aid.lightWarning}</p> : null}
      <Form method="post" className="card mt-6 grid gap-4 sm:grid-cols-2" noValidate>
        <FormError error={e.form} />
        <Field label="Code" name="code" defaultValue={v.code} error={e.code} hint="Short name on the register, e.g. KS3" />
        <Field label="Name" name="name" defaultValue={v.name} error={e.name} />
        <Select label="Type" name="aid_type" defaultValue={v.aid_type} error={e.aid_type} options={AID_TYPES.map((t) => ({ value: t, label: AID_TYPE_LABELS[t] }))} />
        <Select label="IALA category" name="iala_category" defaultValue={v.iala_category} error={e.iala_category} options={[{ value: "", label: "None (e.g. a pier light)" }, ...IALA_CATEGORIES.map((c) => ({ value: c, label: IALA_CATEGORY_LABELS[c] }))]} />
        <Select label="IALA region" name="iala_region" defaultValue={v.iala_region} error={e.iala_region} options={[{ value: "A", label: "A (red to port)" }, { value: "B", label: "B (green to port)" }]} />
        <Field
          label="Light characteristic (as on the chart)"
          name="light_characteristic"
          defaultValue={v.light_characteristic}
          error={e.light_characteristic}
          hint={suggestions.length ? `Usual for this category: ${suggestions.join(", ")}` : "e.g. Fl(2) R 10s, Q(6)+LFl 15s, Oc G 6s; blank if unlit"}
        />
        <Field className="sm:col-span-2" label="Charted position (as read off the chart)" name="charted_position" defaultValue={v.charted_position} error={e.charted_position} hint="e.g. 55°11.520′N 003°00.830′E; for a grid, easting northing in metres" />
        <Select label="Chart datum (CRS)" name="charted_crs" defaultValue={v.charted_crs} error={e.charted_crs} options={CRS_OPTIONS} />
        <div />
        <Field label="Chain length (m)" name="chain_length_m" inputMode="decimal" defaultValue={v.chain_length_m} error={e.chain_length_m} />
        <Field label="Depth at low water (m)" name="depth_m" inputMode="decimal" defaultValue={v.depth_m} error={e.depth_m} />
        <Field label="Stated swing radius (m)" name="swing_radius_m" inputMode="decimal" defaultValue={v.swing_radius_m} error={e.swing_radius_m} hint="Used instead of the mooring when given; 0 for a fixed structure" />
        <div />
        <Select label="Status" name="status" defaultValue={v.status} error={e.status} options={AID_STATUSES.map((s) => ({ value: s, label: AID_STATUS_LABELS[s] }))} />
        <Field label="Reason for a status change" name="status_reason" defaultValue={v.status_reason} hint="Kept in the status history" />
        <TextArea className="sm:col-span-2" label="Remarks" name="remarks" rows={2} defaultValue={v.remarks} error={e.remarks} />
        <div className="sm:col-span-2">
          <button className="btn-primary">{aid ? "Save" : "Add to the register"}</button>
        </div>
      </Form>
      {aid ? (
        <section className="mt-8">
          <h2 className="text-lg font-bold">Status history</h2>
          <table className="mt-2 w-full text-left text-sm" data-testid="status-history">
            <thead>
              <tr className="border-b border-mist">
                <th className="py-2">When</th>
                <th>From</th>
                <th>To</th>
                <th>Why</th>
                <th>By</th>
              </tr>
            </thead>
            <tbody>
              {history.map((h) => (
                <tr key={h.id} className="border-b border-mist">
                  <td className="py-2">{formatInZone(h.changedAt, timeZone)}</td>
                  <td>{h.fromStatus ? AID_STATUS_LABELS[h.fromStatus] : "—"}</td>
                  <td>{AID_STATUS_LABELS[h.toStatus]}</td>
                  <td>
                    {h.reason}
                    {h.reportId ? (
                      <>
                        {" "}
                        <Link to={`/reports/${h.reportId}`} className="underline">
                          (report)
                        </Link>
                      </>
                    ) : null}
                  </td>
                  <td>{h.changedByName ?? "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      ) : null}
    </div>
  );
}
