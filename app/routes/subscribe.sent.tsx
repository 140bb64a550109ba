import { Link } from "react-router";
import type { Route } from "./+types/subscribe.sent";

export const meta: Route.MetaFunction = () => [{ title: "Check your inbox · Tidewire" }];

export async function loader() {
  return null; // public page, nothing to guard
}

export default function SubscribeSent() {
  return (
    <div className="mx-auto max-w-lg">
      <h1 className="text-2xl font-bold">Check your inbox</h1>
      <p className="mt-4">
        If the address can receive mail, a message with a confirmation link is on its way. Nothing else is sent until you confirm. The link works for 72 hours; unconfirmed requests lapse after that.
      </p>
      <p className="mt-4">
        <Link to="/notices" className="btn-secondary">
          See the notices in force
        </Link>
      </p>
    </div>
  );
}
