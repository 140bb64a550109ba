import { data, Link } from "react-router";
import type { Route } from "./+types/reports.detail";
import { Caution } from "~/components/Caution";
import { AssessmentFigures, VerdictBadge } from "~/components/reports/AssessmentSummary";
import { ReportTimeline } from "~/components/reports/ReportTimeline";
import { TriageActions } from "~/components/reports/TriageActions";
import { formatPosition } from "~/lib/geo/positions";
import { can } from "~/lib/permissions";
import { METHOD_LABELS, REPORT_STATUS_LABELS } from "~/lib/reports/schema";
import { formatInZone } from "~/lib/reports/time";
import { getDefaultHarbour } from "~/models/harbour.server";
import { photosOfReports } from "~/models/photo.server";
import { getReport, reportEvents, verifyReportLinkKey } from "~/models/report.server";
import { getOptionalUser, requireCapability } from "~/services/auth.server";
import { handleTriageAction, type TriageActionData } from "~/services/triage.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.report.reference ?? "Report"} · Tidewire` }, { name: "robots", content: "noindex" }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const notFound = () => data({ error: "There is no report at this address, or the link is not valid." }, { status: 404 });
  if (!/^\d{1,9}$/.test(params.id)) throw notFound();
  const id = Number(params.id);
  const user = await getOptionalUser(request);
  const key = new URL(request.url).searchParams.get("key");
  const report = await getReport(id);
  // Owners, triage staff, or a guest with the signed link; anyone else sees the same 404 as
  // for a report that does not exist (no hint that the id is taken).
  const allowed = !!report && ((user && report.reporterUserId === user.id) || (user && can(user.role, "report:triage")) || verifyReportLinkKey(id, key));
  if (!report || !allowed) throw notFound();
  const [events, photos, harbour] = await Promise.all([reportEvents(id), photosOfReports([id]), getDefaultHarbour()]);
  return {
    report: {
      id: report.id,
      reference: report.reference,
      aidId: report.aidId,
      aidCode: report.aidCode,
      aidName: report.aidName,
      hazardDescription: report.hazardDescription,
      method: report.method,
      observedAt: report.observedAt.toISOString(),
      createdAt: report.createdAt.toISOString(),
      status: report.status,
      verdict: report.verdict,
      observedLat: report.observedLat,
      observedLon: report.observedLon,
      uncertaintyM: report.uncertaintyM,
      remarks: report.remarks,
      assessment: report.assessment,
      photoFlags: report.photoFlags,
    },
    isStaff: !!user && can(user.role, "report:triage"),
    events: events.map((e) => ({ ...e, createdAt: e.createdAt.toISOString() })),
    photos: photos.get(id) ?? [],
    timeZone: harbour?.timeZone ?? "Europe/London",
  };
}

/** Triage from the report's own page (officers and the harbourmaster). */
export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "report:triage");
  if (!/^\d{1,9}$/.test(params.id)) throw data({ error: "There is no report at this address." }, { status: 404 });
  return handleTriageAction(request, user, `/reports/${params.id}`);
}

export default function ReportDetail({ loaderData, actionData }: Route.ComponentProps) {
  const { report, events, photos, timeZone, isStaff } = loaderData;
  const failure = actionData as TriageActionData | undefined;
  return (
    <div className="mx-auto max-w-4xl">
      <p className="text-sm font-bold tracking-widest text-deep uppercase">Discrepancy report</p>
      <h1 className="mt-1 text-2xl font-bold">
        {report.reference}: {report.aidCode ? `${report.aidCode} ${report.aidName ?? ""}` : `Uncharted hazard — ${report.hazardDescription}`}
      </h1>
      <div className="mt-2 flex flex-wrap items-center gap-2">
        <span className="badge bg-tide-light text-deep" data-testid="report-status">
          {REPORT_STATUS_LABELS[report.status]}
        </span>
        <VerdictBadge verdict={report.verdict} />
        {isStaff && report.aidId ? (
          <Link to={`/staff/reports/aid/${report.aidId}`} className="underline">
            Triage all reports of {report.aidCode}
          </Link>
        ) : null}
      </div>
      <div className="mt-4">
        <Caution compact />
      </div>
      <div className="mt-6 grid gap-6 md:grid-cols-2">
        <section className="card">
          <h2 className="text-lg font-bold">What was observed</h2>
          <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
            <dt className="text-slate">Method</dt>
            <dd>{METHOD_LABELS[report.method]}</dd>
            <dt className="text-slate">Observed</dt>
            <dd>{formatInZone(report.observedAt, timeZone)}</dd>
            <dt className="text-slate">Position (WGS 84)</dt>
            <dd className="position">
              {formatPosition(report.observedLat, report.observedLon, "ddm", { decimals: 3 })} ±{Math.round(report.uncertaintyM)} m
            </dd>
            <dt className="text-slate">Sent</dt>
            <dd>{formatInZone(report.createdAt, timeZone)}</dd>
          </dl>
          {report.remarks ? <p className="mt-3 whitespace-pre-line">{report.remarks}</p> : null}
          {report.photoFlags.length ? (
            <ul className="mt-3 list-disc rounded-md bg-warn-light py-2 pr-3 pl-8 text-sm">
              {report.photoFlags.map((f) => (
                <li key={f}>{f}</li>
              ))}
            </ul>
          ) : null}
        </section>
        <section className="card">
          <h2 className="text-lg font-bold">Assessment</h2>
          {report.assessment ? <AssessmentFigures result={report.assessment} /> : <p className="mt-2 text-sm">An uncharted hazard has no charted position to compare with.</p>}
        </section>
      </div>
      {photos.length ? (
        <section className="mt-6">
          <h2 className="text-lg font-bold">Photos</h2>
          <ul className="mt-2 flex flex-wrap gap-3">
            {photos.map((p) => (
              <li key={p.id}>
                <a href={`/photos/${p.id}/public`}>
                  <img src={`/photos/${p.id}/thumb`} alt={`Photo ${p.position} of ${report.reference}`} className="h-28 rounded border border-mist" />
                </a>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      {isStaff ? (
        <section className="card mt-6">
          <h2 className="text-lg font-bold">Triage</h2>
          <div className="mt-2">
            <TriageActions report={report} hasAid={report.aidId !== null} others={[]} error={failure ? Object.values(failure.errors)[0] : undefined} />
          </div>
        </section>
      ) : null}
      <section className="mt-6">
        <h2 className="text-lg font-bold">History</h2>
        <ReportTimeline events={events} timeZone={timeZone} />
      </section>
    </div>
  );
}
