// One table of role × capability, used by the server guards and by the UI alike.
export const ROLES = ["boater", "officer", "harbourmaster", "admin"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  boater: "Boater",
  officer: "Harbour officer",
  harbourmaster: "Harbourmaster",
  admin: "Administrator",
};

export type Capability =
  | "report:follow" // see and follow up own reports
  | "subscription:manage-own"
  | "notice:draft"
  | "notice:publish" // publish, amend, cancel, supersede
  | "report:triage"
  | "aid:manage"
  | "mail:admin" // outbox and subscriber overview
  | "user:admin"
  | "harbour:admin";

const MATRIX: Record<Capability, readonly Role[]> = {
  "report:follow": ["boater", "officer", "harbourmaster", "admin"],
  "subscription:manage-own": ["boater", "officer", "harbourmaster", "admin"],
  "notice:draft": ["officer", "harbourmaster"],
  "notice:publish": ["harbourmaster"],
  "report:triage": ["officer", "harbourmaster"],
  "aid:manage": ["officer", "harbourmaster"],
  "mail:admin": ["harbourmaster", "admin"],
  "user:admin": ["admin"],
  "harbour:admin": ["admin"],
};

export function can(role: Role | null | undefined, capability: Capability): boolean {
  return !!role && MATRIX[capability].includes(role);
}

export function isStaff(role: Role | null | undefined): boolean {
  return role === "officer" || role === "harbourmaster" || role === "admin";
}
