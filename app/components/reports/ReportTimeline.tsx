import { REPORT_STATUS_LABELS, type ReportStatus } from "~/lib/reports/schema";
import { formatInZone } from "~/lib/reports/time";

export function ReportTimeline({ events, timeZone }: { events: { id: number; fromStatus: string | null; toStatus: string; note: string | null; actorName: string | null; createdAt: string }[]; timeZone: string }) {
  const label = (s: string) => (s === "draft_notice" ? "Notice drafted" : (REPORT_STATUS_LABELS[s as ReportStatus] ?? s));
  return (
    <ol className="mt-2 grid gap-2 text-sm" data-testid="report-timeline">
      {events.map((e) => (
        <li key={e.id} className="border-l-4 border-tide pl-3">
          <strong>{label(e.toStatus)}</strong> · {formatInZone(e.createdAt, timeZone)}
          {e.actorName ? ` · ${e.actorName}` : ""}
          {e.note ? <div className="text-slate">{e.note}</div> : null}
        </li>
      ))}
    </ol>
  );
}
