import { Link } from "react-router";
import type { Route } from "./+types/staff";
import { can } from "~/lib/permissions";
import { requireRole } from "~/services/auth.server";

export const meta: Route.MetaFunction = () => [{ title: "Staff desk · Tidewire" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, ["officer", "harbourmaster", "admin"]);
  return { role: user.role };
}

export default function StaffDesk({ loaderData }: Route.ComponentProps) {
  const { role } = loaderData;
  const links = [
    { to: "/staff/notices", label: "Notices: drafts, publishing, cancellations", show: can(role, "notice:draft") },
    { to: "/staff/reports", label: "Discrepancy reports: triage queue", show: can(role, "report:triage") },
    { to: "/staff/aids", label: "Aids to navigation register", show: can(role, "aid:manage") },
    { to: "/staff/mail", label: "Subscribers and outgoing mail", show: can(role, "mail:admin") },
    { to: "/admin/users", label: "Users and roles", show: can(role, "user:admin") },
  ].filter((l) => l.show);
  return (
    <div>
      <h1 className="text-2xl font-bold">Staff desk</h1>
      <ul className="mt-6 grid gap-4 sm:grid-cols-2">
        {links.map((l) => (
          <li key={l.to}>
            <Link to={l.to} className="card block font-semibold">
              {l.label}
            </Link>
          </li>
        ))}
      </ul>
    </div>
  );
}
