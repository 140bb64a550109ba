import { Link, useNavigate } from "react-router";
import type { Route } from "./+types/staff.aids";
import { Caution } from "~/components/Caution";
import { ReportMap } from "~/components/reports/ReportMap";
import { AID_STATUS_LABELS, AID_TYPE_LABELS, IALA_CATEGORY_LABELS } from "~/lib/aids/iala";
import { aidLight, aidSwingRadiusM, listAids } from "~/models/aid.server";
import { getDefaultHarbour } from "~/models/harbour.server";
import { requireCapability } from "~/services/auth.server";

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

export default function AidsRegister({ loaderData }: Route.ComponentProps) {
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
              <td>{AID_STATUS_LABELS[a.status]}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
