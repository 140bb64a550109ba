import { Form, Link, data } from "react-router";
import { Caution } from "~/components/Caution";
import type { Route } from "./+types/staff.mail";
import { describeArea } from "~/lib/subscriptions/area";
import { describeSchedule } from "~/lib/subscriptions/schedule";
import { listRecentMail, listTroubledMail, outboxCounts, requeueFailed } from "~/models/outbox.server";
import { getSubscription, listSubscriptionsForStaff, subscriberCounts } from "~/models/subscription.server";
import { requireCapability } from "~/services/auth.server";
import { previewNextDigest } from "~/services/digests.server";
import { readForm } from "~/services/form.server";
import { redirectWithToast } from "~/services/session.server";
import { defaultHarbour } from "~/services/subscriptions.server";

export const meta: Route.MetaFunction = () => [{ title: "Mail and subscribers · Tidewire staff" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "mail:admin");
  const harbour = await defaultHarbour();
  const url = new URL(request.url);
  const previewId = Number(url.searchParams.get("preview") ?? "");
  let preview: null | { id: number; email: string; subject: string; text: string; html: string; itemCount: number; from: string; to: string } = null;
  let previewError: string | null = null;
  if (url.searchParams.has("preview")) {
    const sub = Number.isInteger(previewId) && previewId > 0 ? await getSubscription(previewId) : null;
    if (!sub) previewError = "No subscription with that number.";
    else {
      const p = await previewNextDigest(sub);
      preview = { id: sub.id, email: sub.email, subject: p.mail.subject, text: p.mail.text, html: p.mail.html, itemCount: p.items.length, from: p.window.from.toISOString(), to: p.window.to.toISOString() };
    }
  }
  const [counts, outbox, troubled, recent, subs] = await Promise.all([subscriberCounts(), outboxCounts(), listTroubledMail(), listRecentMail(), listSubscriptionsForStaff({ limit: 30 })]);
  return {
    counts,
    outbox,
    troubled: troubled.map((m: any) => ({ ...m, run_at: new Date(m.run_at).toISOString(), created_at: new Date(m.created_at).toISOString() })),
    recent: recent.map((m: any) => ({ ...m, sent_at: m.sent_at ? new Date(m.sent_at).toISOString() : null })),
    subscriptions: subs.map((s) => ({ id: s.id, email: s.email, status: s.status, label: s.label, area: describeArea(s.area, harbour.name), schedule: describeSchedule(s.digest, harbour.timeZone), urgentAlerts: s.urgentAlerts, nextDigestAt: s.nextDigestAt?.toISOString() ?? null })),
    preview,
    previewError,
  };
}

export async function action({ request }: Route.ActionArgs) {
  await requireCapability(request, "mail:admin");
  const form = await readForm(request);
  const id = Number(form.get("id"));
  if (form.get("intent") !== "resend" || !Number.isInteger(id) || id <= 0) return data({ error: "Choose a failed message to send again.", field: "id" }, { status: 400 });
  const n = await requeueFailed(id);
  if (n === 0) return data({ error: "That message is not in the failed state (already queued or sent).", field: "id" }, { status: 409 });
  return redirectWithToast(request, "/staff/mail", { kind: "success", message: `Message ${id} is queued again.` });
}

const STATUSES = ["queued", "sending", "sent", "failed"] as const;

export default function StaffMail({ loaderData, actionData }: Route.ComponentProps) {
  const { counts, outbox, troubled, recent, subscriptions, preview, previewError } = loaderData;
  const confirmed = counts.filter((c) => c.status === "confirmed");
  const kinds = ["harbour", "circle", "polygon"];
  const cadences = ["none", "daily", "weekly"] as const;
  const cell = (k: string, c: string) => confirmed.filter((x) => x.areaKind === k && x.cadence === c).reduce((a, x) => a + x.count, 0);
  const byStatus = (s: string) => counts.filter((c) => c.status === s).reduce((a, x) => a + x.count, 0);
  const kindsInOutbox = [...new Set(outbox.map((o) => o.kind))].sort();
  return (
    <div className="space-y-8">
      <h1 className="text-2xl font-bold">Mail and subscribers</h1>
      <Caution compact />
      {actionData && "error" in actionData ? <p role="alert" className="field-error">{actionData.error}</p> : null}

      <section className="card">
        <h2 className="text-lg font-semibold">Confirmed subscribers by area and digest</h2>
        <table className="mt-3 w-full text-left text-sm">
          <thead><tr><th>Area</th>{cadences.map((c) => <th key={c}>{c === "none" ? "alerts only" : c}</th>)}<th>total</th></tr></thead>
          <tbody>
            {kinds.map((k) => (
              <tr key={k}><th scope="row">{k}</th>{cadences.map((c) => <td key={c}>{cell(k, c)}</td>)}<td>{cadences.reduce((a, c) => a + cell(k, c), 0)}</td></tr>
            ))}
          </tbody>
        </table>
        <p className="mt-2 text-sm">Awaiting confirmation: {byStatus("pending")} · ended: {byStatus("ended")} · with urgent alerts: {confirmed.filter((c) => c.urgentAlerts).reduce((a, x) => a + x.count, 0)}</p>
      </section>

      <section className="card">
        <h2 className="text-lg font-semibold">Outbox</h2>
        <table className="mt-3 w-full text-left text-sm">
          <thead><tr><th>Kind</th>{STATUSES.map((s) => <th key={s}>{s}</th>)}<th>attempts</th></tr></thead>
          <tbody>
            {kindsInOutbox.map((k) => (
              <tr key={k}>
                <th scope="row">{k}</th>
                {STATUSES.map((s) => <td key={s}>{outbox.filter((o) => o.kind === k && o.status === s).reduce((a, o) => a + o.count, 0)}</td>)}
                <td>{outbox.filter((o) => o.kind === k).reduce((a, o) => a + o.attempts, 0)}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <h3 className="mt-4 font-semibold">Retrying and failed</h3>
        {troubled.length === 0 ? <p className="text-sm">None.</p> : (
          <table className="mt-2 w-full text-left text-sm">
            <thead><tr><th>#</th><th>To</th><th>Subject</th><th>Status</th><th>Attempts</th><th>Next try</th><th>Last error</th><th></th></tr></thead>
            <tbody>
              {troubled.map((m: any) => (
                <tr key={m.id}>
                  <td>{m.id}</td><td>{m.to_address}</td><td>{m.subject}</td><td>{m.status === "queued" ? "retrying" : m.status}</td><td>{m.attempts}</td><td>{m.status === "queued" ? m.run_at : "—"}</td><td className="max-w-xs truncate">{m.last_error}</td>
                  <td>{m.status === "failed" ? (
                    <Form method="post"><input type="hidden" name="id" value={m.id} /><button name="intent" value="resend" className="btn-secondary">Resend</button></Form>
                  ) : null}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        <h3 className="mt-4 font-semibold">Latest messages</h3>
        <table className="mt-2 w-full text-left text-sm">
          <thead><tr><th>#</th><th>Kind</th><th>To</th><th>Subject</th><th>Status</th><th>Attempts</th><th>Sent</th></tr></thead>
          <tbody>{recent.map((m: any) => <tr key={m.id}><td>{m.id}</td><td>{m.kind}</td><td>{m.to_address}</td><td>{m.subject}</td><td>{m.status}</td><td>{m.attempts}</td><td>{m.sent_at ?? "—"}</td></tr>)}</tbody>
        </table>
      </section>

      <section className="card">
        <h2 className="text-lg font-semibold">Subscriptions and the next digest</h2>
        <Form method="get" className="mt-3 flex items-end gap-3">
          <label className="field-label">Subscription number<input name="preview" className="field-input" inputMode="numeric" defaultValue={preview?.id ?? ""} /></label>
          <button type="submit" className="btn-secondary">Preview next digest</button>
        </Form>
        {previewError ? <p className="field-error" role="alert">{previewError}</p> : null}
        {preview ? (
          <div className="mt-4">
            <p className="text-sm">To {preview.email} · {preview.itemCount} change(s) from {preview.from} to now{preview.itemCount === 0 ? " · nothing would be sent" : ""}</p>
            <p className="mt-2 font-semibold">{preview.subject}</p>
            <pre className="mt-2 max-h-96 overflow-auto whitespace-pre-wrap rounded border border-mist bg-white p-3 text-xs">{preview.text}</pre>
            <iframe title="HTML part of the digest" sandbox="" srcDoc={preview.html} className="mt-2 h-96 w-full border border-mist bg-white" />
          </div>
        ) : null}
        <table className="mt-4 w-full text-left text-sm">
          <thead><tr><th>#</th><th>E-mail</th><th>Status</th><th>Area</th><th>Alerts</th><th>Digest</th><th>Next digest</th></tr></thead>
          <tbody>{subscriptions.map((s) => <tr key={s.id}><td><Link to={`/staff/mail?preview=${s.id}`}>{s.id}</Link></td><td>{s.email}{s.label ? ` (${s.label})` : ""}</td><td>{s.status}</td><td>{s.area}</td><td>{s.urgentAlerts ? "yes" : "no"}</td><td>{s.schedule}</td><td>{s.nextDigestAt ?? "—"}</td></tr>)}</tbody>
        </table>
      </section>
    </div>
  );
}
