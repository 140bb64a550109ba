import { data, Form, Link } from "react-router";
import type { Route } from "./+types/staff.reports.aid";
import { Caution } from "~/components/Caution";
import { AssessmentFigures, VerdictBadge } from "~/components/reports/AssessmentSummary";
import { ReportMap } from "~/components/reports/ReportMap";
import { TriageActions } from "~/components/reports/TriageActions";
import { AID_STATUS_LABELS, IALA_CATEGORY_LABELS } from "~/lib/aids/iala";
import { formatPosition } from "~/lib/geo/positions";
import { METHOD_LABELS, REPORT_STATUS_LABELS } from "~/lib/reports/schema";
import { formatInZone } from "~/lib/reports/time";
import { aidSwingRadiusM, getAid, listAids } from "~/models/aid.server";
import { getDefaultHarbour } from "~/models/harbour.server";
import { photosOfReports } from "~/models/photo.server";
import { reportsOfAid } from "~/models/report.server";
import { requireCapability } from "~/services/auth.server";
import { combinedAssessment } from "~/services/report-notice.server";
import { handleTriageAction, type TriageActionData } from "~/services/triage.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Reports of ${data?.aid.code ?? "aid"} · Tidewire` }];

/** Reports that count towards the combined estimate: not duplicates, not refuted, not closed. */
const counts = (s: string) => s === "new" || s === "acknowledged" || s === "confirmed";

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "report:triage");
  if (!/^\d{1,9}$/.test(params.aidId)) throw data({ error: "No such aid" }, { status: 404 });
  const aid = await getAid(Number(params.aidId));
  if (!aid) throw data({ error: "No such aid" }, { status: 404 });
  const [reports, harbour] = await Promise.all([reportsOfAid(aid.id), getDefaultHarbour()]);
  const active = reports.filter((r) => counts(r.status));
  const combined = combinedAssessment(aid, active);
  const photos = await photosOfReports(reports.map((r) => r.id));
  const aids = harbour ? await listAids(harbour.id) : [];
  return {
    timeZone: harbour?.timeZone ?? "Europe/London",
    basemap: harbour?.basemap ?? null,
    aid: {
      id: aid.id,
      code: aid.code,
      name: aid.name,
      category: aid.ialaCategory,
      status: aid.status,
      light: aid.lightCharacteristic,
      charted: `${aid.chartedPositionText} (${aid.chartedCrs})`,
      lat: aid.lat,
      lon: aid.lon,
      swingRadiusM: aidSwingRadiusM(aid),
    },
    aids: aids.map((a) => ({ id: a.id, code: a.code, lat: a.lat, lon: a.lon, category: a.ialaCategory, aidType: a.aidType, status: a.status })),
    combined,
    activeIds: active.map((r) => r.id),
    reports: reports.map((r) => {
      const i = active.findIndex((x) => x.id === r.id);
      const inCombined = i >= 0 && combined ? combined.observations[i]! : null;
      return {
        id: r.id,
        reference: r.reference,
        status: r.status,
        method: r.method,
        observedAt: r.observedAt.toISOString(),
        reporter: r.reporterName ?? r.reporterEmail,
        vessel: r.reporterVessel,
        verdict: r.verdict,
        displacementM: r.displacementM,
        uncertaintyM: r.uncertaintyM,
        observedLat: r.observedLat,
        observedLon: r.observedLon,
        remarks: r.remarks,
        photoFlags: r.photoFlags,
        consistent: inCombined ? inCombined.consistent : null,
        residualM: inCombined ? inCombined.residualM : null,
        duplicateOfId: r.duplicateOfId,
        noticeId: r.noticeId,
        photos: photos.get(r.id) ?? [],
      };
    }),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "report:triage");
  return handleTriageAction(request, user, `/staff/reports/aid/${params.aidId}`);
}

export default function AidReports({ loaderData, actionData }: Route.ComponentProps) {
  const { aid, reports, combined, activeIds, aids, basemap, timeZone } = loaderData;
  const failure = actionData as TriageActionData | undefined;
  const active = reports.filter((r) => activeIds.includes(r.id));
  return (
    <div>
      <p className="text-sm">
        <Link to="/staff/reports" className="underline">
          ← Triage queue
        </Link>
      </p>
      <h1 className="mt-1 text-2xl font-bold">
        Reports of {aid.code} · {aid.name}
      </h1>
      <p className="mt-1 text-slate">
        {aid.category ? IALA_CATEGORY_LABELS[aid.category] : "Aid"} · {aid.light ?? "unlit"} · charted <span className="position">{aid.charted}</span> · swing radius{" "}
        {aid.swingRadiusM === null ? "not known" : `${aid.swingRadiusM.toFixed(1)} m`} · status <strong data-testid="aid-status">{AID_STATUS_LABELS[aid.status]}</strong>
      </p>
      <div className="mt-3">
        <Caution compact />
      </div>
      <div className="mt-6 grid gap-6 lg:grid-cols-[1fr_24rem]">
        <section>
          <ReportMap
            aids={aids}
            selectedAidId={aid.id}
            basemap={basemap}
            height="24rem"
            diagram={
              combined
                ? {
                    charted: combined.charted,
                    swingRadiusM: combined.swingRadiusM,
                    observations: combined.observations.map((o, i) => ({ lat: o.lat, lon: o.lon, uncertaintyM: o.uncertaintyM, consistent: o.consistent, label: `${active[i]?.reference ?? i + 1}${o.consistent ? "" : " (outlier)"}` })),
                    estimate: combined.estimate,
                  }
                : null
            }
            ariaLabel={`Charted position of ${aid.code} with its swing circle, each report's position with its uncertainty circle and the combined estimate; the same figures are in the table below`}
          />
        </section>
        <section className="card" data-testid="combined-estimate">
          <h2 className="text-lg font-bold">Combined estimate</h2>
          {combined ? (
            <>
              <p className="mt-1 text-sm text-slate">
                From {combined.estimate.observationsUsed} of {active.length} open report{active.length === 1 ? "" : "s"}; estimate ±{Math.round(combined.estimate.uncertaintyM)} m (95%).
              </p>
              <AssessmentFigures result={combined} />
            </>
          ) : (
            <p className="mt-2 text-sm">No open reports to combine.</p>
          )}
          {active.length ? (
            <Form method="post" className="mt-4 grid gap-2 border-t border-mist pt-3">
              <input type="hidden" name="intent" value="draft-notice" />
              <input type="hidden" name="aidId" value={aid.id} />
              <fieldset>
                <legend className="text-sm font-semibold">Draft a notice from these reports</legend>
                {active.map((r) => (
                  <label key={r.id} className="mr-3 inline-flex items-center gap-1 text-sm">
                    <input type="checkbox" name="reportIds" value={r.id} defaultChecked={r.consistent !== false} /> {r.reference}
                  </label>
                ))}
              </fieldset>
              {failure?.errors.reportIds ? (
                <p className="field-error" role="alert">
                  {failure.errors.reportIds}
                </p>
              ) : null}
              <button className="btn-primary">Draft a notice from these reports</button>
              <p className="text-xs text-slate">Prefilled: buoy off position (S-124 detail type 51), urgent, REPORTED position from the combined estimate, charted position in the text.</p>
            </Form>
          ) : null}
        </section>
      </div>

      <h2 className="mt-8 text-lg font-bold">Reports</h2>
      <table className="mt-2 w-full text-left text-sm">
        <thead>
          <tr className="border-b border-mist">
            <th className="py-2">Report</th>
            <th>Observation</th>
            <th>Position</th>
            <th>On its own</th>
            <th>In the estimate</th>
            <th>Status</th>
            <th>Actions</th>
          </tr>
        </thead>
        <tbody>
          {reports.map((r) => (
            <tr key={r.id} className="border-b border-mist align-top" data-testid={`aid-report-${r.reference}`}>
              <td className="py-2">
                <Link to={`/reports/${r.id}`} className="font-semibold whitespace-nowrap underline">
                  {r.reference}
                </Link>
                <div className="text-xs text-slate">
                  {r.reporter}
                  {r.vessel ? `, ${r.vessel}` : ""}
                </div>
                {r.photos.length ? (
                  <div className="mt-1 flex gap-1">
                    {r.photos.map((p) => (
                      <a key={p.id} href={`/photos/${p.id}/public`}>
                        <img src={`/photos/${p.id}/thumb`} alt={`Photo ${p.position} of ${r.reference}`} className="h-10 w-10 rounded object-cover" />
                      </a>
                    ))}
                  </div>
                ) : null}
              </td>
              <td>
                {METHOD_LABELS[r.method]}
                <div className="text-xs text-slate">{formatInZone(r.observedAt, timeZone)}</div>
                {r.remarks ? <div className="mt-1 text-xs">{r.remarks}</div> : null}
                {r.photoFlags.map((f) => (
                  <div key={f} className="mt-1 text-xs text-warn">
                    {f}
                  </div>
                ))}
              </td>
              <td className="position">
                {formatPosition(r.observedLat, r.observedLon, "ddm", { decimals: 3 })}
                <div className="text-xs">±{Math.round(r.uncertaintyM)} m</div>
              </td>
              <td>
                <VerdictBadge verdict={r.verdict} />
                {r.displacementM !== null ? <div className="text-xs">{Math.round(r.displacementM)} m</div> : null}
              </td>
              <td>
                {r.consistent === null ? (
                  "—"
                ) : r.consistent ? (
                  <span>consistent{r.residualM !== null ? `, ${Math.round(r.residualM)} m off` : ""}</span>
                ) : (
                  <span className="badge bg-warn-light text-warn" data-testid="outlier">
                    outlier, left out
                  </span>
                )}
              </td>
              <td>
                {REPORT_STATUS_LABELS[r.status]}
                {r.duplicateOfId ? <div className="text-xs">of R-{String(r.duplicateOfId).padStart(4, "0")}</div> : null}
                {r.noticeId ? (
                  <div className="text-xs">
                    <Link to={`/staff/notices/${r.noticeId}/edit`} className="underline">
                      notice
                    </Link>
                  </div>
                ) : null}
              </td>
              <td>
                <TriageActions
                  report={r}
                  hasAid
                  others={reports.filter((o) => o.id !== r.id && o.status !== "duplicate").map((o) => ({ id: o.id, reference: o.reference }))}
                  error={failure?.reportId === r.id ? Object.values(failure.errors)[0] : undefined}
                />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
