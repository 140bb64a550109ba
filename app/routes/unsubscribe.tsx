import { Form, Link, data } from "react-router";
import { Caution } from "~/components/Caution";
import type { Route } from "./+types/unsubscribe";
import { describeArea } from "~/lib/subscriptions/area";
import { readForm } from "~/services/form.server";
import { defaultHarbour, subscriptionFromToken, unsubscribe } from "~/services/subscriptions.server";

export const meta: Route.MetaFunction = () => [{ title: "Unsubscribe · Tidewire" }];

// GET shows one button. POST ends the subscription in one request, with no session and no
// Origin header needed: that is the RFC 8058 one-click POST (body List-Unsubscribe=One-Click)
// a mail client sends to the URL in List-Unsubscribe, and also what the button sends.
export async function loader({ request }: Route.LoaderArgs) {
  const token = new URL(request.url).searchParams.get("token");
  const found = await subscriptionFromToken("unsubscribe", token, { allowEnded: true });
  if (!found.ok) throw data({ error: found.message }, { status: 400 });
  const harbour = await defaultHarbour();
  return { token: token!, ended: found.subscription.status === "ended", email: found.subscription.email, area: describeArea(found.subscription.area, harbour.name) };
}

export async function action({ request }: Route.ActionArgs) {
  const form = await readForm(request);
  const token = new URL(request.url).searchParams.get("token") ?? String(form.get("token") ?? "");
  const found = await subscriptionFromToken("unsubscribe", token, { allowEnded: true });
  if (!found.ok) return data({ error: found.message, done: false }, { status: 400 });
  if (found.subscription.status !== "ended") await unsubscribe(found.subscription);
  return data({ error: null, done: true }, { headers: { "Cache-Control": "no-store" } });
}

export default function Unsubscribe({ loaderData, actionData }: Route.ComponentProps) {
  if (actionData?.error) {
    return (
      <div className="mx-auto max-w-lg">
        <h1 className="text-2xl font-bold">This link does not work</h1>
        <div className="mt-4"><Caution compact /></div>
        <p className="mt-4" role="alert">{actionData.error}</p>
      </div>
    );
  }
  if (actionData?.done || loaderData.ended) {
    return (
      <div className="mx-auto max-w-lg">
        <h1 className="text-2xl font-bold">You are unsubscribed</h1>
        <div className="mt-4"><Caution compact /></div>
        <p className="mt-4" role="status">
          {loaderData.email} will get no more alerts or digests for {loaderData.area}.
        </p>
        <p className="mt-4"><Link to="/subscribe" className="btn-secondary">Subscribe again</Link></p>
      </div>
    );
  }
  return (
    <div className="mx-auto max-w-lg">
      <h1 className="text-2xl font-bold">Unsubscribe</h1>
        <div className="mt-4"><Caution compact /></div>
      <p className="mt-4">
        Stop all alerts and digests to {loaderData.email} for {loaderData.area}?
      </p>
      <Form method="post" className="mt-6">
        <input type="hidden" name="token" value={loaderData.token} />
        <button type="submit" className="btn-danger">Unsubscribe</button>
      </Form>
    </div>
  );
}

export function ErrorBoundary() {
  return (
    <div className="mx-auto max-w-lg">
      <h1 className="text-2xl font-bold">This link does not work</h1>
        <div className="mt-4"><Caution compact /></div>
      <p className="mt-4">This link is not valid or has expired. Links in our e-mails work for a limited time; use the link in a newer message.</p>
    </div>
  );
}
