import { Link } from "react-router";
import type { Route } from "./+types/account.reports";
import { Caution } from "~/components/Caution";
import { VerdictBadge } from "~/components/reports/AssessmentSummary";
import { REPORT_STATUS_LABELS } from "~/lib/reports/schema";
import { formatInZone } from "~/lib/reports/time";
import { getDefaultHarbour } from "~/models/harbour.server";
import { listReportsOfUser } from "~/models/report.server";
import { requireCapability } from "~/services/auth.server";

export const meta: Route.MetaFunction = () => [{ title: "My reports · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "report:follow");
  const [reports, harbour] = await Promise.all([listReportsOfUser(user.id), getDefaultHarbour()]);
  return {
    timeZone: harbour?.timeZone ?? "Europe/London",
    reports: reports.map((r) => ({
      id: r.id,
      reference: r.reference,
      what: r.aidCode ? `${r.aidCode} ${r.aidName ?? ""}` : `Uncharted hazard: ${r.hazardDescription}`,
      status: r.status,
      verdict: r.verdict,
      observedAt: r.observedAt.toISOString(),
    })),
  };
}

export default function MyReports({ loaderData }: Route.ComponentProps) {
  const { reports, timeZone } = loaderData;
  return (
    <div className="mx-auto max-w-4xl">
      <h1 className="text-2xl font-bold">My reports</h1>
      <p className="mt-2">
        <Link to="/report" className="btn-primary">
          Report an aid or hazard
        </Link>
      </p>
      <div className="mt-4">
        <Caution compact />
      </div>
      {reports.length === 0 ? (
        <p className="mt-6">You have not sent any reports yet.</p>
      ) : (
        <table className="mt-6 w-full text-left text-sm">
          <thead>
            <tr className="border-b border-mist">
              <th className="py-2">Report</th>
              <th>What</th>
              <th>Observed</th>
              <th>Verdict</th>
              <th>Status</th>
            </tr>
          </thead>
          <tbody>
            {reports.map((r) => (
              <tr key={r.id} className="border-b border-mist">
                <td className="py-2">
                  <Link to={`/reports/${r.id}`} className="font-semibold underline">
                    {r.reference}
                  </Link>
                </td>
                <td>{r.what}</td>
                <td>{formatInZone(r.observedAt, timeZone)}</td>
                <td>
                  <VerdictBadge verdict={r.verdict} />
                </td>
                <td>{REPORT_STATUS_LABELS[r.status]}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
