import { Form, Link, data } from "react-router";
import { Caution } from "~/components/Caution";
import type { Route } from "./+types/subscribe.confirm";
import { describeArea } from "~/lib/subscriptions/area";
import { describeSchedule } from "~/lib/subscriptions/schedule";
import { readForm } from "~/services/form.server";
import { confirmFromToken, defaultHarbour, subscriptionFromToken } from "~/services/subscriptions.server";

export const meta: Route.MetaFunction = () => [{ title: "Confirm your subscription · Tidewire" }];

// GET shows a button and POST confirms: mail scanners that open links do not confirm for you.
export async function loader({ request }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("token");
  const found = await subscriptionFromToken("confirm", token);
  if (!found.ok) throw data({ error: found.message }, { status: 400 });
  const harbour = await defaultHarbour();
  const s = found.subscription;
  return { token: token!, confirmed: s.status === "confirmed", email: s.email, area: describeArea(s.area, harbour.name), schedule: describeSchedule(s.digest, harbour.timeZone), urgentAlerts: s.urgentAlerts };
}

export async function action({ request }: Route.ActionArgs) {
  const form = await readForm(request);
  const token = String(form.get("token") ?? new URL(request.url).searchParams.get("token") ?? "");
  const result = await confirmFromToken(token);
  if (!result.ok) return data({ error: result.message, confirmed: false }, { status: 400 });
  return { error: null, confirmed: true };
}

export default function ConfirmSubscription({ loaderData, actionData }: Route.ComponentProps) {
  if (actionData?.error) {
    return (
      <div className="mx-auto max-w-lg">
        <h1 className="text-2xl font-bold">This link does not work</h1>
        <div className="mt-4"><Caution compact /></div>
        <p className="mt-4" role="alert">{actionData.error}</p>
      </div>
    );
  }
  if (actionData?.confirmed || loaderData.confirmed) {
    return (
      <div className="mx-auto max-w-lg">
        <h1 className="text-2xl font-bold">Subscription confirmed</h1>
        <div className="mt-4"><Caution compact /></div>
        <p className="mt-4" role="status">
          {loaderData.email} will receive {loaderData.urgentAlerts ? "urgent alerts and " : ""}
          {loaderData.schedule} for {loaderData.area}. Every message has a link to change or end it.
        </p>
        <p className="mt-4">
          <Link to="/notices" className="btn-secondary">See the notices in force</Link>
        </p>
      </div>
    );
  }
  return (
    <div className="mx-auto max-w-lg">
      <h1 className="text-2xl font-bold">Confirm your subscription</h1>
        <div className="mt-4"><Caution compact /></div>
      <p className="mt-4">
        {loaderData.email}: {loaderData.urgentAlerts ? "urgent alerts, " : ""}
        {loaderData.schedule}, for {loaderData.area}.
      </p>
      <Form method="post" className="mt-6">
        <input type="hidden" name="token" value={loaderData.token} />
        <button type="submit" className="btn-primary">Confirm subscription</button>
      </Form>
    </div>
  );
}

export function ErrorBoundary() {
  return (
    <div className="mx-auto max-w-lg">
      <h1 className="text-2xl font-bold">This link does not work</h1>
        <div className="mt-4"><Caution compact /></div>
      <p className="mt-4">This link is not valid or has expired. Links in our e-mails work for a limited time; subscribe again or use the link in a newer message.</p>
      <p className="mt-4"><Link to="/subscribe" className="btn-primary">Subscribe again</Link></p>
    </div>
  );
}
