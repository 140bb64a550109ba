import { Link } from "react-router";
import type { Route } from "./+types/account";
import { ROLE_LABELS, isStaff } from "~/lib/permissions";
import { requireUser } from "~/services/auth.server";

export const meta: Route.MetaFunction = () => [{ title: "Your account · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { user: { name: user.name, email: user.email, role: user.role } };
}

export default function Account({ loaderData }: Route.ComponentProps) {
  const { user } = loaderData;
  return (
    <div className="max-w-3xl">
      <h1 className="text-2xl font-bold">Your account</h1>
      <dl className="card mt-6 grid grid-cols-[10rem_1fr] gap-y-2">
        <dt className="font-semibold">Name</dt>
        <dd>{user.name}</dd>
        <dt className="font-semibold">E-mail</dt>
        <dd>{user.email}</dd>
        <dt className="font-semibold">Role</dt>
        <dd>{ROLE_LABELS[user.role]}</dd>
      </dl>
      <ul className="mt-6 list-disc space-y-1 pl-6">
        <li>
          <Link to="/account/reports">Your discrepancy reports</Link>
        </li>
        <li>
          <Link to="/account/subscriptions">Your alerts and digests</Link>
        </li>
        {isStaff(user.role) ? (
          <li>
            <Link to="/staff">Staff desk</Link>
          </li>
        ) : null}
      </ul>
    </div>
  );
}
