import { Form, Link, useNavigation } from "react-router";
import { data } from "react-router";
import type { Route } from "./+types/subscribe";
import { rateLimited } from "~/services/rate-limit.server";
import { Caution } from "~/components/Caution";
import { FormError } from "~/components/forms";
import { SubscriptionFields, valuesFromSubmitted } from "~/components/subscriptions/SubscriptionForm";
import { formToObject, parseSubscriptionForm } from "~/lib/subscriptions/form";
import { getOptionalUser } from "~/services/auth.server";
import { env } from "~/env.server";
import { getHarbourBasemap } from "~/models/subscription.server";
import { readForm } from "~/services/form.server";
import { redirectWithToast } from "~/services/session.server";
import { defaultHarbour, requestSubscription } from "~/services/subscriptions.server";

export const meta: Route.MetaFunction = () => [{ title: "Subscribe to notices · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getOptionalUser(request);
  const harbour = await defaultHarbour();
  return {
    harbour: { name: harbour.name, authorityName: harbour.authorityName, timeZone: harbour.timeZone },
    email: user?.email ?? "",
    map: { basemap: await getHarbourBasemap(harbour.id), tileUrl: env().MAP_TILE_URL ?? null },
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const user = await getOptionalUser(request);
  const harbour = await defaultHarbour();
  const form = await readForm(request);
  const raw = formToObject(form);
  const values = () => Object.fromEntries(Object.entries(raw).map(([k, v]) => [k, Array.isArray(v) ? v : String(v ?? "").slice(0, 12_000)]));
  // Each request may send a confirmation mail: limit them per address, keeping what was typed.
  const limited = await rateLimited("subscribe", request, context);
  if (limited) {
    return data({ errors: { form: limited.message } as Record<string, string | undefined>, values: values() }, { status: 429, headers: { "Retry-After": String(limited.retryAfterS) } });
  }
  const parsed = parseSubscriptionForm(raw, harbour.timeZone, { withEmail: true });
  if (!parsed.ok) {
    return data({ errors: parsed.errors as Record<string, string | undefined>, values: values() }, { status: 400 });
  }
  const outcome = await requestSubscription(parsed.data, harbour, user ? { id: user.id, email: user.email } : null);
  // A signed-in boater's own (verified) address needs no confirmation mail.
  if (outcome === "confirmed") return redirectWithToast(request, "/account/subscriptions", { kind: "success", message: "Subscription saved." });
  // One answer for every other address, known or not.
  return redirectWithToast(request, "/subscribe/sent", { kind: "success", message: "Check your inbox: we have sent a link to confirm." });
}

export default function Subscribe({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  const values = actionData ? valuesFromSubmitted(actionData.values) : { email: loaderData.email };
  return (
    <div className="max-w-3xl">
      <h1 className="text-2xl font-bold">Alerts and digests by e-mail</h1>
      <p className="mt-2">
        Get the notices of {loaderData.harbour.authorityName} that concern the waters you use: an alert at once for urgent ones, and a digest at a time that suits you. No account needed; every
        message has a link to change or end your subscription.
      </p>
      <div className="mt-4">
        <Caution compact />
      </div>
      <Form method="post" className="card mt-6 space-y-6" noValidate>
        {actionData?.errors ? <FormError error={actionData.errors.form ?? "Please correct the fields marked below."} /> : null}
        <SubscriptionFields values={values} errors={actionData?.errors ?? {}} withEmail timeZone={loaderData.harbour.timeZone} harbourName={loaderData.harbour.name} map={loaderData.map} />
        <button type="submit" className="btn-primary" disabled={busy}>
          Subscribe
        </button>
      </Form>
      <p className="mt-4 text-sm">
        Signed in? Manage yours under <Link to="/account/subscriptions">your alerts and digests</Link>.
      </p>
    </div>
  );
}
