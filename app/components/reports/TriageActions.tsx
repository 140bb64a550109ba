// The triage actions allowed from a report's current status (plain forms: work without JS).
import { Form } from "react-router";
import { AID_STATUS_LABELS, AID_STATUSES } from "~/lib/aids/iala";
import { TRANSITIONS, type ReportStatus } from "~/lib/reports/schema";

export function TriageActions(props: { report: { id: number; reference: string; status: ReportStatus }; hasAid: boolean; others: { id: number; reference: string }[]; error?: string }) {
  const { report } = props;
  const allowed = TRANSITIONS[report.status];
  if (allowed.length === 0) return <span className="text-slate">—</span>;
  return (
    <div className="grid gap-2" data-testid={`actions-${report.reference}`}>
      {props.error ? (
        <p className="field-error" role="alert">
          {props.error}
        </p>
      ) : null}
      <Form method="post" className="flex flex-wrap items-end gap-2">
        <input type="hidden" name="intent" value="status" />
        <input type="hidden" name="reportId" value={report.id} />
        <label className="sr-only" htmlFor={`note-${report.id}`}>
          Note to the reporter ({report.reference})
        </label>
        <input id={`note-${report.id}`} name="note" className="field-input w-48" placeholder="Note to the reporter (optional)" maxLength={1000} />
        {allowed.includes("acknowledged") ? (
          <button className="btn-secondary" name="to" value="acknowledged">
            Acknowledge
          </button>
        ) : null}
        {allowed.includes("confirmed") ? (
          <span className="flex items-end gap-1">
            {props.hasAid ? (
              <>
                <label className="sr-only" htmlFor={`aidStatus-${report.id}`}>
                  Aid status on confirming {report.reference}
                </label>
                <select id={`aidStatus-${report.id}`} name="aidStatus" className="field-input w-36" defaultValue="off_station">
                  {AID_STATUSES.filter((s) => s !== "operating" && s !== "withdrawn").map((s) => (
                    <option key={s} value={s}>
                      {AID_STATUS_LABELS[s]}
                    </option>
                  ))}
                </select>
              </>
            ) : null}
            <button className="btn-primary" name="to" value="confirmed">
              Confirm
            </button>
          </span>
        ) : null}
        {allowed.includes("not_confirmed") ? (
          <button className="btn-secondary" name="to" value="not_confirmed">
            Not confirmed
          </button>
        ) : null}
        {allowed.includes("closed") ? (
          <button className="btn-secondary" name="to" value="closed">
            Close (no action)
          </button>
        ) : null}
      </Form>
      {allowed.includes("duplicate") && props.others.length ? (
        <Form method="post" className="flex flex-wrap items-end gap-2">
          <input type="hidden" name="intent" value="status" />
          <input type="hidden" name="reportId" value={report.id} />
          <label className="text-sm" htmlFor={`dup-${report.id}`}>
            Duplicate of
          </label>
          <select id={`dup-${report.id}`} name="duplicateOf" className="field-input w-32">
            {props.others.map((o) => (
              <option key={o.id} value={o.id}>
                {o.reference}
              </option>
            ))}
          </select>
          <button className="btn-secondary" name="to" value="duplicate">
            Mark duplicate
          </button>
        </Form>
      ) : null}
    </div>
  );
}
