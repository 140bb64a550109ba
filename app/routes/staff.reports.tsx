import { Link } from "react-router";
import type { Route } from "./+types/staff.reports";
import { Caution } from "~/components/Caution";
import { VerdictBadge } from "~/components/reports/AssessmentSummary";
import { TriageActions } from "~/components/reports/TriageActions";
import { REPORT_STATUS_LABELS } from "~/lib/reports/schema";
import { closeReportsOfPublishedNotices, triageQueue } from "~/models/report.server";
import { requireCapability } from "~/services/auth.server";
import { handleTriageAction, type TriageActionData } from "~/services/triage.server";

export const meta: Route.MetaFunction = () => [{ title: "Report triage · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "report:triage");
  await closeReportsOfPublishedNotices(); // the worker does this too; the queue must not lag behind it
  const all = new URL(request.url).searchParams.get("show") === "all";
  const reports = await triageQueue({ includeClosed: all });
  const now = Date.now();
  return {
    all,
    reports: reports.map((r) => ({
      id: r.id,
      reference: r.reference,
      aidId: r.aidId,
      aidCode: r.aidCode,
      aidName: r.aidName,
      hazard: r.hazardDescription,
      verdict: r.verdict,
      displacementM: r.displacementM,
      uncertaintyM: r.uncertaintyM,
      status: r.status,
      method: r.method,
      reporter: r.reporterName ?? r.reporterEmail,
      vessel: r.reporterVessel,
      ageH: (now - r.createdAt.getTime()) / 3_600_000,
      photoFlags: r.photoFlags.length,
    })),
  };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireCapability(request, "report:triage");
  return handleTriageAction(request, user, "/staff/reports");
}

const age = (h: number) => (h < 1 ? `${Math.max(1, Math.round(h * 60))} min` : h < 48 ? `${Math.round(h)} h` : `${Math.round(h / 24)} days`);

export default function TriageQueue({ loaderData, actionData }: Route.ComponentProps) {
  const { reports, all } = loaderData;
  const errors = (actionData as TriageActionData | undefined)?.errors ?? {};
  return (
    <div>
      <h1 className="text-2xl font-bold">Discrepancy reports</h1>
      <p className="mt-1 text-slate">Most serious first (off station, uncharted hazards, inconclusive, within swing circle), oldest first within each.</p>
      <div className="mt-3 flex flex-wrap gap-3">
        <Link to={all ? "/staff/reports" : "/staff/reports?show=all"} className="btn-secondary">
          {all ? "Show open reports only" : "Show all, including closed"}
        </Link>
        <Link to="/staff/aids" className="btn-secondary">
          Aids register
        </Link>
      </div>
      <div className="mt-4">
        <Caution compact />
      </div>
      {Object.values(errors).length ? (
        <p role="alert" className="field-error mt-3">
          {Object.values(errors)[0]}
        </p>
      ) : null}
      {reports.length === 0 ? (
        <p className="mt-6">No open reports.</p>
      ) : (
        <table className="mt-6 w-full text-left text-sm" data-testid="triage-queue">
          <thead>
            <tr className="border-b border-mist">
              <th className="py-2">Report</th>
              <th>Aid or hazard</th>
              <th>Verdict</th>
              <th>Displacement</th>
              <th>Age</th>
              <th>Status</th>
              <th>Reporter</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {reports.map((r) => (
              <tr key={r.id} className="border-b border-mist" data-testid={`queue-row-${r.reference}`}>
                <td className="py-2 font-semibold whitespace-nowrap">
                  <Link to={`/reports/${r.id}`} className="underline">
                    {r.reference}
                  </Link>
                </td>
                <td>{r.aidCode ? `${r.aidCode}` : `Hazard: ${r.hazard}`}</td>
                <td>
                  <VerdictBadge verdict={r.verdict} />
                </td>
                <td>{r.displacementM !== null ? `${Math.round(r.displacementM)} m ± ${Math.round(r.uncertaintyM)} m` : `± ${Math.round(r.uncertaintyM)} m`}</td>
                <td>{age(r.ageH)}</td>
                <td>
                  {REPORT_STATUS_LABELS[r.status]}
                  {r.photoFlags ? <span className="badge ml-1 bg-warn-light text-warn">photo check</span> : null}
                </td>
                <td>
                  {r.reporter}
                  {r.vessel ? `, ${r.vessel}` : ""}
                </td>
                <td className="whitespace-nowrap">
                  {r.aidId ? (
                    <Link to={`/staff/reports/aid/${r.aidId}`} className="underline">
                      Triage {r.aidCode}
                    </Link>
                  ) : (
                    <TriageActions report={r} hasAid={false} others={[]} error={(actionData as TriageActionData | undefined)?.reportId === r.id ? Object.values(errors)[0] : undefined} />
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
