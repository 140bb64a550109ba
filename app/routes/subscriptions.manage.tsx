import { Form, Link, data, useNavigation } from "react-router";
import type { Route } from "./+types/subscriptions.manage";
import { Caution } from "~/components/Caution";
import { FormError } from "~/components/forms";
import { SubscriptionFields, valuesFromSubmitted } from "~/components/subscriptions/SubscriptionForm";
import { formToObject, parseSubscriptionForm } from "~/lib/subscriptions/form";
import { env } from "~/env.server";
import { getHarbourBasemap } from "~/models/subscription.server";
import { readForm } from "~/services/form.server";
import { changeSubscription, defaultHarbour, formValuesOf, subscriptionFromToken, unsubscribe } from "~/services/subscriptions.server";

export const meta: Route.MetaFunction = () => [{ title: "Your subscription · Tidewire" }];

// The signed manage link from any of our mails: change or end a subscription without signing in.
export async function loader({ request }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("token");
  const found = await subscriptionFromToken("manage", token);
  if (!found.ok) throw data({ error: found.message }, { status: 400 });
  const harbour = await defaultHarbour();
  return {
    token: token!,
    values: formValuesOf(found.subscription),
    status: found.subscription.status,
    harbour: { name: harbour.name, timeZone: harbour.timeZone },
    map: { basemap: await getHarbourBasemap(harbour.id), tileUrl: env().MAP_TILE_URL ?? null },
  };
}

export async function action({ request }: Route.ActionArgs) {
  const form = await readForm(request);
  const token = String(form.get("token") ?? "");
  const found = await subscriptionFromToken("manage", token);
  if (!found.ok) return data({ error: found.message, errors: {} as Record<string, string | undefined>, saved: false, ended: false }, { status: 400 });
  if (form.get("intent") === "end") {
    await unsubscribe(found.subscription);
    return { error: null, errors: {} as Record<string, string | undefined>, saved: false, ended: true };
  }
  const harbour = await defaultHarbour();
  const raw = formToObject(form);
  const parsed = parseSubscriptionForm(raw, harbour.timeZone, { withEmail: false });
  if (!parsed.ok) return data({ error: null, errors: parsed.errors as Record<string, string | undefined>, saved: false, ended: false, values: raw }, { status: 400 });
  await changeSubscription(found.subscription, parsed.data);
  return { error: null, errors: {} as Record<string, string | undefined>, saved: true, ended: false };
}

export default function ManageSubscription({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  if (actionData?.error) {
    return (
      <div className="mx-auto max-w-lg">
        <h1 className="text-2xl font-bold">This link does not work</h1>
        <p className="mt-4" role="alert">{actionData.error}</p>
      </div>
    );
  }
  if (actionData?.ended) {
    return (
      <div className="mx-auto max-w-lg">
        <h1 className="text-2xl font-bold">Subscription ended</h1>
        <p className="mt-4" role="status">No more alerts or digests will be sent to {loaderData.values.email} for this subscription.</p>
        <p className="mt-4"><Link to="/subscribe" className="btn-secondary">Subscribe again</Link></p>
      </div>
    );
  }
  return (
    <div className="max-w-3xl">
      <h1 className="text-2xl font-bold">Your subscription</h1>
      <p className="mt-2">For {loaderData.values.email}{loaderData.status === "pending" ? " (not confirmed yet: use the link in the confirmation mail)" : ""}.</p>
      <div className="mt-4"><Caution compact /></div>
      {actionData?.saved ? <p className="mt-4 rounded-md border border-kelp bg-foam px-4 py-3" role="status">Your changes are saved.</p> : null}
      <Form method="post" className="card mt-6 space-y-6" noValidate>
        {actionData && Object.keys(actionData.errors).length ? <FormError error="Please correct the fields marked below." /> : null}
        <input type="hidden" name="token" value={loaderData.token} />
        <SubscriptionFields values={actionData && "values" in actionData && actionData.values ? { ...valuesFromSubmitted(actionData.values), email: loaderData.values.email } : loaderData.values} errors={actionData?.errors ?? {}} withEmail={false} timeZone={loaderData.harbour.timeZone} harbourName={loaderData.harbour.name} map={loaderData.map} />
        <div className="flex flex-wrap gap-3">
          <button type="submit" name="intent" value="save" className="btn-primary" disabled={busy}>Save changes</button>
          <button type="submit" name="intent" value="end" className="btn-danger" disabled={busy}>End this subscription</button>
        </div>
      </Form>
    </div>
  );
}

export function ErrorBoundary() {
  return (
    <div className="mx-auto max-w-lg">
      <h1 className="text-2xl font-bold">This link does not work</h1>
      <p className="mt-4">This link is not valid or has expired. Links in our e-mails work for a limited time; use the link in a newer message.</p>
    </div>
  );
}
