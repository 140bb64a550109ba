// The role × route matrix: every loader and action of every route in app/routes.ts is called as
// each role, and who is refused is asserted. A route missing from ACCESS fails the test, so a
// new route cannot ship without a decision about who may use it.
import { beforeAll, beforeEach, describe, expect, it } from "vitest";
import routes from "~/routes";
import { db } from "~/db.server";
import { seed as seedHarbour } from "../../seeds/02_harbour";
import type { Role } from "~/lib/permissions";
import { call, sessionCookieFor, signedInAs } from "../support/routes";

type Who = "public" | "signed-in" | "anonymous-only" | readonly Role[];
type Access = { path: string; params?: Record<string, string>; loader?: Who; action?: Who };

const STAFF = ["officer", "harbourmaster", "admin"] as const;
const DRAFTERS = ["officer", "harbourmaster"] as const;

/** route file → who may call its loader and action. */
export const ACCESS: Record<string, Access> = {
  "routes/home.tsx": { path: "/", loader: "public" },
  "routes/sign-in.tsx": { path: "/sign-in", loader: "anonymous-only", action: "anonymous-only" },
  "routes/sign-up.tsx": { path: "/sign-up", loader: "anonymous-only", action: "anonymous-only" },
  "routes/sign-out.ts": { path: "/sign-out", loader: "public", action: "public" },
  "routes/verify-email.tsx": { path: "/verify-email?token=nope", loader: "public" },
  "routes/forgot-password.tsx": { path: "/forgot-password", loader: "anonymous-only", action: "anonymous-only" },
  "routes/reset-password.tsx": { path: "/reset-password?token=nope", loader: "public", action: "public" },
  "routes/accept-invite.tsx": { path: "/accept-invite?token=nope", loader: "public", action: "public" },
  "routes/account.tsx": { path: "/account", loader: "signed-in" },
  "routes/staff.tsx": { path: "/staff", loader: STAFF },
  "routes/admin.users.tsx": { path: "/admin/users", loader: ["admin"], action: ["admin"] },
  "routes/healthz.ts": { path: "/healthz", loader: "public" },
  "routes/tools.tsx": { path: "/tools", loader: "public" },
  "routes/api.v1.convert.ts": { path: "/api/v1/convert?from=EPSG:4230&to=EPSG:4326&position=55N%203E", loader: "public" },
  "routes/api.v1.measure.ts": { path: "/api/v1/measure?from=55N%203E&to=55.1N%203E", loader: "public" },
  "routes/api.v1.assessments.ts": { path: "/api/v1/assessments", loader: "public", action: "public" },
  "routes/subscribe.tsx": { path: "/subscribe", loader: "public", action: "public" },
  "routes/subscribe.sent.tsx": { path: "/subscribe/sent", loader: "public" },
  "routes/subscribe.confirm.tsx": { path: "/subscribe/confirm?token=forged", loader: "public", action: "public" },
  "routes/subscriptions.manage.tsx": { path: "/subscriptions/manage?token=forged", loader: "public", action: "public" },
  "routes/unsubscribe.tsx": { path: "/unsubscribe?token=forged", loader: "public", action: "public" },
  "routes/account.subscriptions.tsx": { path: "/account/subscriptions", loader: "signed-in", action: "signed-in" },
  "routes/staff.mail.tsx": { path: "/staff/mail", loader: ["harbourmaster", "admin"], action: ["harbourmaster", "admin"] },
  "routes/not-found.tsx": { path: "/no-such-page", loader: "public", action: "public" },
  // Aids register and discrepancy reports (a missing id answers 404 to those allowed).
  "routes/report.tsx": { path: "/report", loader: "public", action: "public" },
  "routes/reports.detail.tsx": { path: "/reports/999999", params: { id: "999999" }, loader: "public", action: DRAFTERS },
  "routes/account.reports.tsx": { path: "/account/reports", loader: "signed-in" },
  "routes/staff.reports.tsx": { path: "/staff/reports", loader: DRAFTERS, action: DRAFTERS },
  "routes/staff.reports.aid.tsx": { path: "/staff/reports/aid/999999", params: { aidId: "999999" }, loader: DRAFTERS, action: DRAFTERS },
  "routes/staff.aids.tsx": { path: "/staff/aids", loader: DRAFTERS, action: DRAFTERS },
  "routes/staff.aids.csv.ts": { path: "/staff/aids.csv", loader: DRAFTERS },
  "routes/staff.aids.import.tsx": { path: "/staff/aids/import", loader: DRAFTERS, action: DRAFTERS },
  "routes/staff.aids.edit.tsx": { path: "/staff/aids/new", params: { aidId: "new" }, loader: DRAFTERS, action: DRAFTERS },
  "routes/photos.ts": { path: "/photos/00000000-0000-4000-8000-000000000000/thumb", params: { id: "00000000-0000-4000-8000-000000000000", size: "thumb" }, loader: "public" },
  "routes/api.v1.aids.ts": { path: "/api/v1/aids", loader: "public" },
  "routes/api.v1.reports.ts": { path: "/api/v1/reports", loader: "public", action: "public" },
  "routes/api.v1.uploads.ts": { path: "/api/v1/uploads", loader: "public", action: "public" },
  "routes/api.v1.uploads.complete.ts": { path: "/api/v1/uploads/00000000-0000-4000-8000-000000000000/complete", params: { id: "00000000-0000-4000-8000-000000000000" }, action: "public" },
  // Notices: public reads (a missing id answers 404); drafting for officers and harbourmasters
  // (publishing, cancelling and superseding are refused to officers inside the action, tested in
  // tests/integration/notices-api.test.ts).
  "routes/notices.tsx": { path: "/notices", loader: "public" },
  "routes/notices.id.tsx": { path: "/notices/999999", params: { id: "999999" }, loader: "public" },
  "routes/notices.gpx.ts": { path: "/notices/999999/gpx", params: { id: "999999" }, loader: "public" },
  "routes/bulletin.tsx": { path: "/bulletin", loader: "public" },
  "routes/feeds.tsx": { path: "/feeds", loader: "public" },
  "routes/feeds.notices.atom.ts": { path: "/feeds/notices.atom", loader: "public" },
  "routes/api.v1.notices.ts": { path: "/api/v1/notices", loader: "public" },
  "routes/api.v1.notices.id.ts": { path: "/api/v1/notices/999999", params: { id: "999999" }, loader: "public" },
  "routes/staff.notices.tsx": { path: "/staff/notices", loader: DRAFTERS },
  "routes/staff.notices.new.tsx": { path: "/staff/notices/new", loader: DRAFTERS, action: DRAFTERS },
  "routes/staff.notices.edit.tsx": { path: "/staff/notices/999999/edit", params: { id: "999999" }, loader: DRAFTERS, action: DRAFTERS },
};
void DRAFTERS;

type RouteEntry = { file: string; children?: RouteEntry[] };
function files(entries: RouteEntry[]): string[] {
  return entries.flatMap((e) => [e.file, ...files(e.children ?? [])]);
}

const ROLES_UNDER_TEST = ["anonymous", "boater", "officer", "harbourmaster", "admin"] as const;
type Tester = (typeof ROLES_UNDER_TEST)[number];

function allowed(who: Who, tester: Tester): boolean {
  if (who === "public") return true;
  if (who === "signed-in") return tester !== "anonymous";
  if (who === "anonymous-only") return tester === "anonymous";
  return tester !== "anonymous" && (who as readonly string[]).includes(tester);
}

/** Refused means: sent to sign-in, 401/403, or (for anonymous-only pages) sent to the account. */
function refused(res: { status: number; location: string | null }): boolean {
  if (res.status === 401 || res.status === 403) return true;
  return res.status >= 300 && res.status < 400 && !!res.location && /^\/(sign-in|account)(\?|$)/.test(res.location);
}

describe("role × route matrix", () => {
  const cookies: Partial<Record<Tester, string>> = {};
  const userIds: Partial<Record<Tester, number>> = {};
  beforeAll(async () => {
    // Public pages need the harbour (and its aids) to exist; other files may have made it.
    if (!(await db("harbours").first())) await seedHarbour(db);
    for (const role of ["boater", "officer", "harbourmaster", "admin"] as const) userIds[role] = (await signedInAs(role)).user.id;
  });
  // Fresh sessions for every case: calling sign-out as each role must not affect the next case.
  beforeEach(async () => {
    for (const [role, id] of Object.entries(userIds)) cookies[role as Tester] = await sessionCookieFor(id!);
  });

  it("lists every route in app/routes.ts", () => {
    const missing = files(routes as RouteEntry[]).filter((f) => !ACCESS[f]);
    expect(missing, "add these routes to ACCESS with who may use them").toEqual([]);
  });

  for (const [file, access] of Object.entries(ACCESS)) {
    for (const kind of ["loader", "action"] as const) {
      const who = access[kind];
      if (!who) continue;
      it(`${kind} of ${file}`, async () => {
        const mod = await import(/* @vite-ignore */ `../../app/${file}`);
        // A public route without that export has nothing to guard; a guarded one must have it.
        if (who === "public" && typeof mod[kind] !== "function") return;
        expect(typeof mod[kind], `${file} should export a ${kind}`).toBe("function");
        for (const tester of ROLES_UNDER_TEST) {
          const res = await call(mod[kind], {
            path: access.path,
            params: access.params,
            method: kind === "action" ? "POST" : "GET",
            form: kind === "action" ? {} : undefined,
            cookie: cookies[tester],
          });
          const wasRefused = refused(res);
          expect(wasRefused, `${tester} ${kind === "action" ? "POST" : "GET"} ${access.path} → ${res.status} ${res.location ?? ""}`).toBe(!allowed(who, tester));
          expect(res.status, `${tester} ${access.path} must never 500`).toBeLessThan(500);
        }
      });
    }
  }
});
