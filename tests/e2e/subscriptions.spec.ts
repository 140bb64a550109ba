// Subscriptions in Chromium: subscribe without an account, confirm through the captured mail,
// the harbourmaster publishes an urgent notice in the area through the notices UI, the alert
// arrives, and its unsubscribe link works (the page's button and the RFC 8058 one-click POST).
import { expect, test, type Page } from "@playwright/test";
import { linkIn, waitForMail } from "../support/mail";

async function signIn(page: Page, email: string, password: string) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByTestId("toast")).toContainText("Signed in as");
}

test("subscribe, confirm by mail, get an urgent alert for the area, unsubscribe from it", async ({ browser, request }) => {
  test.setTimeout(90_000);
  const email = `skipper-${Date.now()}@subscribers.example`;
  const other = `pilot-${Date.now()}@subscribers.example`;
  const title = `KS4 buoy damaged ${Date.now()}`;

  // 1. Subscribe: a 1.5 M circle around the harbour mouth, urgent alerts, no digest.
  const page = await (await browser.newContext()).newPage();
  await subscribeWholeHarbour(page, other); // a second subscriber, for the one-click POST below
  await page.goto("/subscribe");
  await expect(page.getByText("Tidewire informs; it does not replace official charts").first()).toBeVisible();
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("A circle around a position").check();
  await page.getByLabel("Centre (WGS 84)").fill("55°12.30′N 003°02.04′E");
  await page.getByLabel("Radius (M)").fill("1.5");
  await page.getByLabel("Aids to navigation changes").check();
  await page.getByRole("button", { name: "Subscribe" }).click();
  await expect(page).toHaveURL(/\/subscribe\/sent$/);
  await expect(page.getByRole("heading", { name: "Check your inbox" })).toBeVisible();

  // 2. Confirm through the captured mail (GET shows the button; the POST confirms).
  const confirm = await waitForMail({ to: email, subject: "Confirm your", timeoutMs: 20_000 });
  await page.goto(linkIn(confirm, "/subscribe/confirm"));
  await expect(page.getByText("1.5 M around 55°12.30′N 003°02.04′E")).toBeVisible();
  await page.getByRole("button", { name: "Confirm subscription" }).click();
  await expect(page.getByRole("heading", { name: "Subscription confirmed" })).toBeVisible();

  // 3. The harbourmaster publishes an urgent notice inside the circle through the notices UI.
  const hm = await (await browser.newContext()).newPage();
  await signIn(hm, "harbourmaster@kestrel-sound.example", "skerrow-hm-2026");
  await hm.goto("/staff/notices/new");
  await hm.getByLabel("Title (key subject)").fill(title);
  await hm.getByLabel("General type (IHO S-124)").selectOption("aids_to_navigation_changes");
  await hm.getByLabel("URGENT").check();
  await hm.getByLabel("Until further notice").check();
  await hm.getByLabel("Locality").fill("Kestrel Sound, approach channel");
  await hm.getByLabel("Text (amplifying remarks)").fill("KS4 port-hand buoy damaged and listing. Navigate with caution.");
  const part = hm.getByTestId("part-0");
  await part.getByLabel("Kind").selectOption("point");
  await part.getByLabel("Datum / grid of the positions").selectOption("EPSG:4326");
  await part.getByLabel("Positions, one per line").fill("55°12.10′N 003°01.50′E");
  await hm.getByRole("button", { name: "Save and publish" }).click();
  await expect(hm.getByTestId("toast")).toContainText(/Published KSH \d{4}\/\d{3}/);
  const noticeId = Number(/\/notices\/(\d+)$/.exec(hm.url())![1]);

  // 4. The alert arrives (the worker delivers the outbox), with the notice link and the position.
  const alert = await waitForMail({ to: email, subject: title, timeoutMs: 20_000 });
  expect(alert.subject).toMatch(/^URGENT: KSH \d{4}\/\d{3} /);
  expect(alert.text).toContain("55°12.10′N 003°01.50′E");
  await page.goto(linkIn(alert, `/notices/${noticeId}`));
  await expect(page.getByRole("heading", { name: title })).toBeVisible();
  const listUnsubscribe = alert.headerLines.find((h) => h.key === "list-unsubscribe")!.line.replace(/\r?\n[ \t]+/g, " ");
  const oneClickUrl = /<(http[^>]+)>/.exec(listUnsubscribe)![1];
  expect(alert.headerLines.find((h) => h.key === "list-unsubscribe-post")!.line).toBe("List-Unsubscribe-Post: List-Unsubscribe=One-Click");

  // 5. The unsubscribe link in the mail opens a page with one button, which ends it.
  await page.goto(linkIn(alert, "/unsubscribe"));
  await page.getByRole("button", { name: "Unsubscribe" }).click();
  await expect(page.getByRole("heading", { name: "You are unsubscribed" })).toBeVisible();
  await page.goto(linkIn(alert, "/unsubscribe"));
  await expect(page.getByRole("heading", { name: "You are unsubscribed" })).toBeVisible();

  // 6. The other subscriber's mail client uses the header: one POST, no cookies, no Origin.
  const otherAlert = await waitForMail({ to: other, subject: title, timeoutMs: 20_000 });
  const otherHeader = otherAlert.headerLines.find((h) => h.key === "list-unsubscribe")!.line.replace(/\r?\n[ \t]+/g, " ");
  const otherUrl = /<(http[^>]+)>/.exec(otherHeader)![1];
  expect(otherUrl).not.toBe(oneClickUrl);
  const res = await request.post(otherUrl, { form: { "List-Unsubscribe": "One-Click" } });
  expect(res.status()).toBe(200);
  await page.goto(otherUrl);
  await expect(page.getByRole("heading", { name: "You are unsubscribed" })).toBeVisible();
});

async function subscribeWholeHarbour(page: Page, email: string) {
  await page.goto("/subscribe");
  await page.getByLabel("E-mail address").fill(email);
  await page.getByRole("button", { name: "Subscribe" }).click();
  await expect(page).toHaveURL(/\/subscribe\/sent$/);
  const confirm = await waitForMail({ to: email, subject: "Confirm your", timeoutMs: 20_000 });
  await page.goto(linkIn(confirm, "/subscribe/confirm"));
  await page.getByRole("button", { name: "Confirm subscription" }).click();
  await expect(page.getByRole("heading", { name: "Subscription confirmed" })).toBeVisible();
  return confirm;
}

test("a link made for one purpose does not work for another", async ({ page }) => {
  const email = `purpose-${Date.now()}@subscribers.example`;
  const confirm = await subscribeWholeHarbour(page, email);
  const confirmToken = new URL(linkIn(confirm, "/subscribe/confirm")).searchParams.get("token")!;
  const res = await page.goto(`/unsubscribe?token=${encodeURIComponent(confirmToken)}`);
  expect(res!.status()).toBe(400);
  await expect(page.getByRole("heading", { name: "This link does not work" })).toBeVisible();
});

test("drawing a circle on the map fills the centre and radius fields", async ({ page }) => {
  await page.goto("/subscribe");
  const map = page.getByTestId("map");
  await expect(map.locator("canvas").first()).toBeAttached({ timeout: 15_000 });
  await page.getByRole("button", { name: "Draw a circle" }).click();
  const box = (await map.boundingBox())!;
  const cx = box.x + box.width / 2;
  const cy = box.y + box.height / 2;
  await page.mouse.click(cx, cy);
  await page.mouse.move(cx + 60, cy, { steps: 5 });
  await page.mouse.click(cx + 60, cy);
  await expect(page.getByLabel("A circle around a position")).toBeChecked();
  await expect(page.getByLabel("Centre (WGS 84)")).toHaveValue(/^\d{2}°\d{2}\.\d{2}′N 00\d°\d{2}\.\d{2}′E$/);
  await expect(page.getByLabel("Radius (M)")).toHaveValue(/^\d+(\.\d+)?$/);
});

test.describe("without JavaScript", () => {
  test.use({ javaScriptEnabled: false });

  test("bad input comes back beside the fields with what was typed", async ({ page }) => {
    await page.goto("/subscribe");
    await page.getByLabel("E-mail address").fill("two@example.org, three@example.org");
    await page.getByLabel("A polygon (corners typed or drawn on the map)").check();
    await page.getByLabel("Polygon corners (WGS 84), one position per line").fill("55°13′N 3°00′E\n55°11′N 3°04′E\n55°13′N 3°04′E\n55°11′N 3°00′E");
    await page.getByLabel("Digest").selectOption("daily");
    await page.getByLabel(/^Time/).fill("01:30");
    await page.getByRole("button", { name: "Subscribe" }).click();
    await expect(page.getByText("Enter one e-mail address only.")).toBeVisible();
    await expect(page.getByText(/The polygon's edges cross each other near/)).toBeVisible();
    await expect(page.getByText(/01:30 does not exist in Europe\/London on .* clocks go forward from 01:00 to 02:00/)).toBeVisible();
    await expect(page.getByLabel("E-mail address")).toHaveValue("two@example.org, three@example.org");
  });
});
