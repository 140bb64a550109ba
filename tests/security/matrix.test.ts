// The role × route matrix over HTTP against the production build: every loader (GET, as a
// document and as React Router's single-fetch `.data` request) and every action (POST, same
// origin) of every route in app/routes.ts, as each role. A route missing from ACCESS fails the
// suite, so a new route cannot ship without a decision about who may use it.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import routes from "~/routes";
import { closeQdb, qdb } from "../../scripts/quality/db";
import { request, type Reply } from "../../scripts/quality/http";
import { cookiesByRole, TESTERS, type Tester } from "../../scripts/quality/people";
import { fixtures, type Fixtures } from "./fixtures";

type Who = "public" | "signed-in" | "anonymous-only" | readonly string[];
type Access = {
  path: string | ((f: Fixtures) => string | undefined);
  loader?: Who;
  action?: Who;
  /** Body of the probing POST (default: empty form). */
  form?: Record<string, string>;
  json?: unknown;
  /** A resource route answering JSON (API) rather than a page. */
  api?: boolean;
};

const STAFF = ["officer", "harbourmaster", "admin"] as const;
const DRAFTERS = ["officer", "harbourmaster"] as const;
const PUBLISHERS = ["harbourmaster"] as const;
const MAIL_ADMINS = ["harbourmaster", "admin"] as const;
const ADMINS = ["admin"] as const;
void PUBLISHERS;

/** route file → who may call its loader and its action. */
const ACCESS: Record<string, Access> = {
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
  "routes/admin.users.tsx": { path: "/admin/users", loader: ADMINS, action: ADMINS },
  "routes/healthz.ts": { path: "/healthz", loader: "public", api: true },
  "routes/not-found.tsx": { path: "/no-such-page", loader: "public", action: "public" },
  // Aids register and discrepancy reports. /reports/:id is "public" only with the signed link:
  // without it (as here) everyone but the owner and staff gets 404, which is not a refusal.
  "routes/report.tsx": { path: "/report", loader: "public", action: "public" },
  "routes/reports.detail.tsx": { path: (f) => (f.reportId ? `/reports/${f.reportId}` : undefined), loader: "public", action: DRAFTERS },
  "routes/account.reports.tsx": { path: "/account/reports", loader: "signed-in" },
  "routes/staff.reports.tsx": { path: "/staff/reports", loader: DRAFTERS, action: DRAFTERS },
  "routes/staff.reports.aid.tsx": { path: (f) => (f.aidId ? `/staff/reports/aid/${f.aidId}` : undefined), loader: DRAFTERS, action: DRAFTERS },
  "routes/staff.aids.tsx": { path: "/staff/aids", loader: DRAFTERS, action: DRAFTERS },
  "routes/staff.aids.csv.ts": { path: "/staff/aids.csv", loader: DRAFTERS, api: true },
  "routes/staff.aids.import.tsx": { path: "/staff/aids/import", loader: DRAFTERS, action: DRAFTERS },
  "routes/staff.aids.edit.tsx": { path: (f) => (f.aidId ? `/staff/aids/${f.aidId}` : undefined), loader: DRAFTERS, action: DRAFTERS },
  "routes/photos.ts": { path: (f) => `/photos/${f.photoId ?? "00000000-0000-4000-8000-000000000000"}/thumb`, loader: "public", api: true },
  "routes/api.v1.aids.ts": { path: "/api/v1/aids", loader: "public", api: true },
  "routes/api.v1.reports.ts": { path: "/api/v1/reports", loader: "public", action: "public", api: true, json: {} },
  "routes/api.v1.uploads.ts": { path: "/api/v1/uploads", loader: "public", action: "public", api: true, json: {} },
  // Notices: public reading, staff drafting (notice:draft = officer + harbourmaster).
  "routes/notices.tsx": { path: "/notices", loader: "public" },
  "routes/notices.id.tsx": { path: (f) => (f.noticeId ? `/notices/${f.noticeId}` : undefined), loader: "public" },
  "routes/notices.gpx.ts": { path: (f) => (f.noticeId ? `/notices/${f.noticeId}/gpx` : undefined), loader: "public", api: true },
  "routes/bulletin.tsx": { path: "/bulletin", loader: "public" },
  "routes/feeds.tsx": { path: "/feeds", loader: "public" },
  "routes/feeds.notices.atom.ts": { path: "/feeds/notices.atom", loader: "public", api: true },
  "routes/api.v1.notices.ts": { path: "/api/v1/notices", loader: "public", api: true },
  "routes/api.v1.notices.id.ts": { path: (f) => (f.noticeId ? `/api/v1/notices/${f.noticeId}` : undefined), loader: "public", api: true },
  "routes/staff.notices.tsx": { path: "/staff/notices", loader: DRAFTERS },
  "routes/staff.notices.new.tsx": { path: "/staff/notices/new", loader: DRAFTERS, action: DRAFTERS },
  "routes/staff.notices.edit.tsx": { path: (f) => (f.draftNoticeId ? `/staff/notices/${f.draftNoticeId}/edit` : undefined), loader: DRAFTERS, action: DRAFTERS },
  // Subscriptions: anyone subscribes (confirmed by e-mail); token links manage; staff see mail.
  "routes/subscribe.tsx": { path: "/subscribe", loader: "public", action: "public" },
  "routes/subscribe.sent.tsx": { path: "/subscribe/sent", loader: "public" },
  "routes/subscribe.confirm.tsx": { path: "/subscribe/confirm?token=nope", loader: "public", action: "public" },
  "routes/subscriptions.manage.tsx": { path: "/subscriptions/manage?token=nope", loader: "public", action: "public" },
  "routes/unsubscribe.tsx": { path: "/unsubscribe?token=nope", loader: "public", action: "public" },
  "routes/account.subscriptions.tsx": { path: "/account/subscriptions", loader: "signed-in", action: "signed-in" },
  "routes/staff.mail.tsx": { path: "/staff/mail", loader: MAIL_ADMINS, action: MAIL_ADMINS },
  // Geo tools: public, nothing stored.
  "routes/tools.tsx": { path: "/tools", loader: "public" },
  "routes/api.v1.convert.ts": { path: "/api/v1/convert", loader: "public", api: true },
  "routes/api.v1.measure.ts": { path: "/api/v1/measure", loader: "public", api: true },
  "routes/api.v1.assessments.ts": { path: "/api/v1/assessments", loader: "public", action: "public", api: true, json: {} },
  "routes/api.v1.uploads.complete.ts": { path: "/api/v1/uploads/00000000-0000-4000-8000-000000000000/complete", action: "public", api: true },
};

type RouteEntry = { file: string; children?: RouteEntry[] };
const files = (entries: RouteEntry[]): string[] => entries.flatMap((e) => [e.file, ...files(e.children ?? [])]);

function allowed(who: Who, tester: Tester): boolean {
  if (who === "public") return true;
  if (who === "signed-in") return tester !== "anonymous";
  if (who === "anonymous-only") return tester === "anonymous";
  return tester !== "anonymous" && (who as readonly string[]).includes(tester);
}

/** Refused: sent to sign-in (or, for anonymous-only pages, to the account), or 401/403. */
function refused(r: Reply): boolean {
  if (r.status === 401 || r.status === 403) return true;
  return r.status >= 300 && r.status < 400 && !!r.location && /^(https?:\/\/[^/]+)?\/(sign-in|account)(\?|$)/.test(r.location);
}

/** Single-fetch (`/x.data`) replies: 403/401, or 202 with a SingleFetchRedirect to sign-in. */
function dataRefused(r: Reply): boolean {
  if (r.status === 401 || r.status === 403) return true;
  return r.status === 202 && /"SingleFetchRedirect"/.test(r.text) && /"\/(sign-in|account)[?"]/.test(r.text);
}

const base = () => process.env.QUALITY_BASE_URL!;
let fx: Fixtures;

beforeAll(async () => {
  fx = await fixtures(qdb());
});
afterAll(closeQdb);

describe("role × route matrix over HTTP", () => {
  it("lists every route in app/routes.ts", () => {
    const missing = files(routes as RouteEntry[]).filter((f) => !ACCESS[f]);
    expect(missing, "add these routes to ACCESS in tests/security/matrix.test.ts").toEqual([]);
  });

  for (const [file, access] of Object.entries(ACCESS)) {
    for (const kind of ["loader", "action"] as const) {
      const who = access[kind];
      if (!who) continue;
      it(`${kind} of ${file}`, async () => {
        const path = typeof access.path === "function" ? access.path(fx) : access.path;
        expect(path, `no fixture for ${file}`).toBeTruthy();
        const outcome: string[] = [];
        for (const tester of TESTERS) {
          // Fresh sessions each time: sign-out as one role must not affect the next case.
          const c = await cookiesByRole(qdb(), process.env.SESSION_SECRET!).then((all) => all[tester]);
          const r =
            kind === "loader"
              ? await request(base(), path!, { cookie: c })
              : await request(base(), path!, { method: "POST", cookie: c, ...(access.json !== undefined ? { json: access.json } : { form: access.form ?? {} }) });
          outcome.push(`${tester} ${kind === "loader" ? "GET" : "POST"} ${path} → ${r.status} ${r.location ?? ""}`);
          expect(r.status, `never a 500: ${outcome.at(-1)}\n${r.text.slice(0, 400)}`).toBeLessThan(500);
          expect(refused(r), outcome.join("\n")).toBe(!allowed(who, tester));
          if (kind === "loader" && !access.api && !allowed(who, tester) && who !== "anonymous-only") {
            // The client-side navigation path must refuse as well, not leak the loader's data.
            const [p, q] = path!.split("?");
            const d = await request(base(), `${p === "/" ? "/_root" : p}.data${q ? "?" + q : ""}`, { cookie: c });
            expect(d.status, `${tester} GET ${p}.data must not 500`).toBeLessThan(500);
            expect(dataRefused(d), `${tester} GET ${p}.data → ${d.status} ${d.text.slice(0, 300)}`).toBe(true);
          }
        }
      });
    }
  }
});
