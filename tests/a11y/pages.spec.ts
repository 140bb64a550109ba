// axe-core (WCAG 2.0/2.1 A and AA rules) on every public and staff page, each as the role that
// uses it, after hydration (and after the lazy map has loaded where there is one); plus the
// pages in their error states (a form sent back with field errors, the 404 page).
import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Browser, type Page } from "@playwright/test";
import { qdb } from "../../scripts/quality/db";
import { createAccount, sessionCookie, type Tester } from "../../scripts/quality/people";
import { fixtures, type Fixtures } from "../security/fixtures";

const TAGS = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"];

/** `status`: what the page answers (the default, below 400; error pages say theirs). */
/** `fast`: part of the short run inside `npm test` (QUALITY_FAST=1); the full list otherwise. */
type PageCase = { path: string | ((f: Fixtures) => string | undefined); as: Tester; name?: string; status?: number[]; fast?: true; then?: (page: Page) => Promise<void> };
const BAD_TOKEN = [200, 400, 404, 410];

const PAGES: PageCase[] = [
  // Public
  { path: "/", as: "anonymous", fast: true },
  { path: "/notices", as: "anonymous" },
  { path: (f) => (f.noticeId ? `/notices/${f.noticeId}` : undefined), as: "anonymous", name: "/notices/:id", fast: true },
  { path: "/bulletin", as: "anonymous" },
  { path: "/feeds", as: "anonymous" },
  { path: "/report", as: "anonymous", fast: true },
  { path: "/subscribe", as: "anonymous", fast: true },
  { path: "/subscribe/sent", as: "anonymous" },
  { path: "/tools", as: "anonymous", fast: true },
  { path: "/sign-in", as: "anonymous", fast: true },
  { path: "/sign-up", as: "anonymous" },
  { path: "/forgot-password", as: "anonymous" },
  { path: "/reset-password?token=not-a-token", as: "anonymous", status: BAD_TOKEN },
  { path: "/accept-invite?token=not-a-token", as: "anonymous", status: BAD_TOKEN },
  { path: "/verify-email?token=not-a-token", as: "anonymous", status: BAD_TOKEN },
  { path: "/unsubscribe?token=not-a-token", as: "anonymous", status: BAD_TOKEN },
  { path: "/subscriptions/manage?token=not-a-token", as: "anonymous", status: BAD_TOKEN },
  { path: "/no-such-page", as: "anonymous", name: "404 page", status: [404], fast: true },
  {
    path: "/sign-up",
    as: "anonymous",
    name: "/sign-up with field errors",
    then: async (page) => {
      await page.getByRole("button", { name: /create|sign up/i }).click();
      // Native `required` validation blocks empty submits; fill invalid values instead.
      await page.getByLabel("Your name").fill("x");
      await page.getByLabel("E-mail address").fill("not-an-address@");
      await page.getByLabel("Password", { exact: true }).fill("short");
      await page.getByLabel("Repeat the password").fill("other");
      await page.locator("form[method=post] button[type=submit]").last().click();
      await expect(page.locator('[role="alert"]').first()).toBeVisible();
    },
  },
  // Boater
  { path: "/", as: "boater", name: "/ (signed in)" },
  { path: "/account", as: "boater", fast: true },
  { path: "/account/subscriptions", as: "boater" },
  { path: "/account/reports", as: "boater" },
  { path: "/report", as: "boater", name: "/report (signed in)" },
  // Staff
  { path: "/staff", as: "officer" },
  { path: "/staff/notices", as: "officer" },
  { path: "/staff/notices/new", as: "officer", fast: true },
  { path: (f) => (f.draftNoticeId ? `/staff/notices/${f.draftNoticeId}/edit` : undefined), as: "harbourmaster", name: "/staff/notices/:id/edit" },
  { path: "/staff/reports", as: "officer", fast: true },
  { path: (f) => (f.reportId ? `/reports/${f.reportId}` : undefined), as: "officer", name: "/reports/:id (staff)" },
  { path: (f) => (f.aidId ? `/staff/reports/aid/${f.aidId}` : undefined), as: "officer", name: "/staff/reports/aid/:aidId" },
  { path: "/staff/aids", as: "officer" },
  { path: "/staff/aids/import", as: "officer" },
  { path: (f) => (f.aidId ? `/staff/aids/${f.aidId}` : undefined), as: "officer", name: "/staff/aids/:aidId" },
  { path: "/staff/mail", as: "harbourmaster" },
  { path: "/admin/users", as: "admin", fast: true },
];

async function contextFor(browser: Browser, as: Tester) {
  const context = await browser.newContext();
  if (as !== "anonymous") {
    const a = await createAccount(qdb(), as);
    const [name, value] = (await sessionCookie(qdb(), process.env.SESSION_SECRET!, a.id)).split(/=(.*)/s);
    await context.addCookies([{ name, value, url: process.env.QUALITY_BASE_URL! }]);
  }
  return context;
}

let fx: Fixtures;
test.beforeAll(async () => {
  fx = await fixtures(qdb());
});

for (const c of process.env.QUALITY_FAST === "1" ? PAGES.filter((p) => p.fast) : PAGES) {
  const title = c.name ?? (typeof c.path === "string" ? c.path : "page");
  test(`${title} as ${c.as}: no WCAG 2.1 A/AA violations`, async ({ browser }) => {
    const path = typeof c.path === "function" ? c.path(fx) : c.path;
    expect(path, `no fixture row for ${title}`).toBeTruthy();
    const context = await contextFor(browser, c.as);
    const page = await context.newPage();
    const res = await page.goto(path!);
    if (c.status) expect(c.status, `${path} as ${c.as}`).toContain(res?.status());
    else expect(res?.status(), `${path} as ${c.as}`).toBeLessThan(400);
    await page.waitForLoadState("networkidle");
    // Where a map is shown, let the lazy chunk load and draw before checking.
    if (await page.locator('[data-testid="map"]').count()) await page.locator('[data-testid="map"] canvas').first().waitFor({ state: "attached" });
    if (c.then) await c.then(page);
    const result = await new AxeBuilder({ page }).withTags(TAGS).analyze();
    const summary = result.violations.map((v) => `${v.id} (${v.impact}): ${v.help}\n    ${v.nodes.slice(0, 5).map((n) => n.target.join(" ")).join("\n    ")}`);
    expect(summary, `axe violations on ${path} as ${c.as}`).toEqual([]);
    // A page that axe could not really check would pass silently: make sure it saw content.
    expect(result.passes.length).toBeGreaterThan(10);
    await context.close();
  });
}
