import { Form, NavLink } from "react-router";
import { can, isStaff, ROLE_LABELS, type Role } from "~/lib/permissions";
import { Logo } from "./Logo";

type HeaderUser = { name: string; role: Role } | null;

const navClass = ({ isActive }: { isActive: boolean }) =>
  `rounded px-2 py-1 text-sm font-semibold text-white no-underline hover:bg-deep-dark hover:no-underline ${isActive ? "bg-deep-dark" : ""}`;

export function SiteHeader({ user }: { user: HeaderUser }) {
  return (
    <header className="no-print bg-deep text-white">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:bg-white focus:px-3 focus:py-2 focus:text-ink">
        Skip to content
      </a>
      <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3">
        <NavLink to="/" className="no-underline hover:no-underline" aria-label="Tidewire home">
          <Logo />
        </NavLink>
        <nav aria-label="Main" className="flex flex-wrap items-center gap-1">
          <NavLink to="/" end className={navClass}>
            Board
          </NavLink>
          <NavLink to="/notices" className={navClass}>
            Notices
          </NavLink>
          <NavLink to="/report" className={navClass}>
            Report a mark
          </NavLink>
          <NavLink to="/subscribe" className={navClass}>
            Alerts
          </NavLink>
          <NavLink to="/tools" className={navClass}>
            Position tools
          </NavLink>
          {isStaff(user?.role) ? (
            <NavLink to="/staff" className={navClass}>
              Staff desk
            </NavLink>
          ) : null}
          {can(user?.role, "user:admin") ? (
            <NavLink to="/admin/users" className={navClass}>
              Admin
            </NavLink>
          ) : null}
        </nav>
        <div className="ml-auto flex items-center gap-2 text-sm">
          {user ? (
            <>
              <NavLink to="/account" className={navClass}>
                {user.name} <span className="font-normal opacity-80">({ROLE_LABELS[user.role]})</span>
              </NavLink>
              <Form method="post" action="/sign-out">
                <button type="submit" className="rounded border border-white/40 px-2 py-1 text-sm font-semibold hover:bg-deep-dark">
                  Sign out
                </button>
              </Form>
            </>
          ) : (
            <>
              <NavLink to="/sign-in" className={navClass}>
                Sign in
              </NavLink>
              <NavLink to="/sign-up" className={navClass}>
                Create account
              </NavLink>
            </>
          )}
        </div>
      </div>
    </header>
  );
}
