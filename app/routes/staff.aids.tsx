import { data, Form, Link, useNavigate } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/staff.aids";
import { Caution } from "~/components/Caution";
import { ReportMap } from "~/components/reports/ReportMap";
import { AID_STATUS_LABELS, AID_STATUSES, AID_TYPE_LABELS, IALA_CATEGORY_LABELS } from "~/lib/aids/iala";
import { db } from "~/db.server";
import { aidLight, aidSwingRadiusM, getAid, listAids, setAidStatus } from "~/models/aid.server";
import { getDefaultHarbour } from "~/models/harbour.server";
import { requireCapability } from "~/services/auth.server";
import { readForm } from "~/services/form.server";
import { redirectWithToast } from "~/services/session.server";

export const meta: Route.MetaFunction = () => [{ title: "Aids to navigation register · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "aid:manage");
  const harbour = await getDefaultHarbour();
  const aids = harbour ? await listAids(harbour.id, { includeWithdrawn: true }) : [];
  return {
    basemap: harbour?.basemap ?? null,
    aids: aids.map((a) => ({
      lat: a.lat,
      lon: a.lon,
      ialaCategory: a.ialaCategory,
      aidType: a.aidType,
      id: a.id,
      code: a.code,
      name: a.name,
      type: AID_TYPE_LABELS[a.aidType],
      category: a.ialaCategory ? IALA_CATEGORY_LABELS[a.ialaCategory] : "—",
      region: a.ialaRegion,
      light: a.lightCharacteristic,
      lightDescription: aidLight(a)?.description ?? null,
      charted: a.chartedPositionText,
      crs: a.chartedCrs,
      swingRadiusM: aidSwingRadiusM(a),
      status: a.status,
    })),
  };
}

const statusSchema = z.object({
  aidId: z.coerce.number().int().positive({ error: "Choose an aid" }),
  status: z.enum(AID_STATUSES, { error: "Choose a status" }),
  reason: z.string().trim().max(500, { error: "At most 500 characters" }).optional(),
});

/** Quick status change from the list (with a history row), e.g. a light reported unlit. */
export async function action({ request }: Route.ActionArgs) {
  const user = await requireCapability(request, "aid:manage");
  const form = await readForm(request);
  const parsed = statusSchema.safeParse(Object.fromEntries(form));
  if (!parsed.success) return data({ error: parsed.error.issues[0]!.message }, { status: 400 });
  const aid = await getAid(parsed.data.aidId);
  if (!aid) return data({ error: "No such aid" }, { status: 404 });
  const changed = await db.transaction((trx) => setAidStatus(aid.id, parsed.data.status, { reason: parsed.data.reason || "Changed on the register list", userId: user.id }, trx));
  return redirectWithToast(request, "/staff/aids", { kind: "success", message: changed ? `${aid.code} is now ${AID_STATUS_LABELS[parsed.data.status].toLowerCase()}.` : `${aid.code} was already ${AID_STATUS_LABELS[parsed.data.status].toLowerCase()}.` });
}

export default function AidsRegister({ loaderData, actionData }: Route.ComponentProps) {
  const { aids, basemap } = loaderData;
  const navigate = useNavigate();
  return (
    <div>
      <h1 className="text-2xl font-bold">Aids to navigation register</h1>
      <div className="mt-3 flex flex-wrap gap-3">
        <Link to="/staff/aids/new" className="btn-primary">
          Add an aid
        </Link>
        <Link to="/staff/aids/import" className="btn-secondary">
          Import CSV
        </Link>
        <a href="/staff/aids.csv" className="btn-secondary" download>
          Export CSV
        </a>
        <a href="/api/v1/aids" className="btn-secondary">
          GeoJSON
        </a>
        <Link to="/staff/reports" className="btn-secondary">
          Report triage
        </Link>
      </div>
      <div className="mt-4">
        <Caution compact />
      </div>
      {(actionData as { error?: string } | undefined)?.error ? (
        <p role="alert" className="field-error mt-3">
          {(actionData as { error: string }).error}
        </p>
      ) : null}
      <div className="mt-4">
        <ReportMap
          aids={aids.map((a) => ({ id: a.id, code: a.code, lat: a.lat, lon: a.lon, category: a.ialaCategory, aidType: a.aidType, status: a.status }))}
          selectedAidId={null}
          onSelectAid={(id) => navigate(`/staff/aids/${id}`)}
          basemap={basemap}
          diagram={null}
          height="22rem"
          ariaLabel="Map of the aids in the register (the table below lists the same aids); click an aid to edit it. Aids not operating are ringed."
        />
      </div>
      <table className="mt-6 w-full text-left text-sm" data-testid="aids-table">
        <thead>
          <tr className="border-b border-mist">
            <th className="py-2">Code</th>
            <th>Name</th>
            <th>Type</th>
            <th>IALA</th>
            <th>Light</th>
            <th>Charted position</th>
            <th>Swing</th>
            <th>Status</th>
          </tr>
        </thead>
        <tbody>
          {aids.map((a) => (
            <tr key={a.id} className="border-b border-mist">
              <td className="py-2 font-semibold">
                <Link to={`/staff/aids/${a.id}`} className="underline">
                  {a.code}
                </Link>
              </td>
              <td>{a.name}</td>
              <td>{a.type}</td>
              <td>
                {a.category} ({a.region})
              </td>
              <td title={a.lightDescription ?? undefined}>{a.light ?? "—"}</td>
              <td className="position">
                {a.charted} <span className="text-xs text-slate">{a.crs}</span>
              </td>
              <td>{a.swingRadiusM === null ? "—" : `${a.swingRadiusM.toFixed(1)} m`}</td>
              <td>
                <Form method="post" className="flex items-center gap-1">
                  <input type="hidden" name="aidId" value={a.id} />
                  <label className="sr-only" htmlFor={`status-${a.id}`}>
                    Status of {a.code}
                  </label>
                  <select id={`status-${a.id}`} name="status" defaultValue={a.status} className="field-input w-32 py-1">
                    {AID_STATUSES.map((s) => (
                      <option key={s} value={s}>
                        {AID_STATUS_LABELS[s]}
                      </option>
                    ))}
                  </select>
                  <button className="btn-secondary px-2 py-1 text-xs">Set</button>
                </Form>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
