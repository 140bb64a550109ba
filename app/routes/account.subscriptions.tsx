import { Form, Link, data } from "react-router";
import type { Route } from "./+types/account.subscriptions";
import { FormError } from "~/components/forms";
import { describeArea } from "~/lib/subscriptions/area";
import { describeSchedule } from "~/lib/subscriptions/schedule";
import { generalTypeLabel } from "~/lib/notices/vocabulary";
import { claimSubscriptionsForUser, endSubscription, listSubscriptionsForUser } from "~/models/subscription.server";
import { requireCapability } from "~/services/auth.server";
import { readForm } from "~/services/form.server";
import { redirectWithToast } from "~/services/session.server";
import { subscriptionToken } from "~/services/subscription-mail.server";
import { defaultHarbour } from "~/services/subscriptions.server";

export const meta: Route.MetaFunction = () => [{ title: "Your alerts and digests · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "subscription:manage-own");
  // Subscriptions made with this (verified) address before signing in belong to the account.
  await claimSubscriptionsForUser(user);
  const harbour = await defaultHarbour();
  const subs = await listSubscriptionsForUser(user);
  return {
    email: user.email,
    subscriptions: subs.map((s) => ({
      id: s.id,
      status: s.status,
      area: describeArea(s.area, harbour.name),
      types: s.generalTypes.length ? s.generalTypes.map(generalTypeLabel).join(", ") : "All types",
      urgentAlerts: s.urgentAlerts,
      schedule: describeSchedule(s.digest, harbour.timeZone),
      manageToken: subscriptionToken("manage", s.id),
    })),
  };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireCapability(request, "subscription:manage-own");
  const form = await readForm(request);
  const id = Number(form.get("id"));
  const mine = (await listSubscriptionsForUser(user)).find((s) => s.id === id);
  if (!Number.isInteger(id) || !mine) return data({ error: "No such subscription in your account.", field: "id" }, { status: 404 });
  await endSubscription(id, "unsubscribed");
  return redirectWithToast(request, "/account/subscriptions", { kind: "success", message: "Subscription ended." });
}

export default function AccountSubscriptions({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <div className="max-w-3xl">
      <h1 className="text-2xl font-bold">Your alerts and digests</h1>
      <p className="mt-2">Subscriptions for {loaderData.email}.</p>
      {actionData && "error" in actionData ? (
        <div className="mt-4">
          <FormError error={actionData.error} />
        </div>
      ) : null}
      {loaderData.subscriptions.length === 0 ? (
        <p className="card mt-6">You have no subscriptions yet.</p>
      ) : (
        <ul className="mt-6 space-y-4">
          {loaderData.subscriptions.map((s) => (
            <li key={s.id} className="card">
              <p className="font-semibold">{s.area}{s.status === "pending" ? <span className="badge ml-2">awaiting confirmation</span> : null}</p>
              <p className="text-sm">{s.urgentAlerts ? "Urgent alerts" : "No urgent alerts"} · {s.schedule} · {s.types}</p>
              <div className="mt-3 flex flex-wrap gap-3">
                <Link to={`/subscriptions/manage?token=${encodeURIComponent(s.manageToken)}`} className="btn-secondary">Change</Link>
                <Form method="post">
                  <input type="hidden" name="id" value={s.id} />
                  <button type="submit" className="btn-danger">End</button>
                </Form>
              </div>
            </li>
          ))}
        </ul>
      )}
      <p className="mt-6"><Link to="/subscribe" className="btn-primary">Add a subscription</Link></p>
    </div>
  );
}
