import { expect, test } from "@playwright/test";
import { linkIn, waitForMail } from "../support/mail";

test("a boater signs up, confirms by the e-mailed link, signs in and signs out", async ({ page }) => {
  const email = `e2e-${Date.now()}@boaters.example`;
  await page.goto("/sign-up");
  await page.getByLabel("Your name").fill("Fenella Rook");
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password", { exact: true }).fill("rook's long passphrase");
  await page.getByLabel("Repeat the password").fill("rook's long passphrase");
  await page.getByRole("button", { name: "Create account" }).click();
  await expect(page.getByTestId("toast")).toContainText(`We sent a confirmation link to ${email}`);

  const mail = await waitForMail({ to: email, subject: "Confirm your e-mail", timeoutMs: 20_000 });
  await page.goto(linkIn(mail, "/verify-email"));
  await expect(page).toHaveURL(/\/sign-in$/);
  await expect(page.getByTestId("toast")).toContainText("Your e-mail address is confirmed");

  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill("rook's long passphrase");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL(/\/account$/);
  await expect(page.getByRole("heading", { name: "Your account" })).toBeVisible();
  await expect(page.getByText(email)).toBeVisible();

  await page.getByRole("button", { name: "Sign out" }).click();
  await expect(page.getByTestId("toast")).toContainText("You are signed out");
  await page.goto("/account");
  await expect(page).toHaveURL(/\/sign-in\?redirectTo=%2Faccount/);
});

test.describe("without JavaScript", () => {
  test.use({ javaScriptEnabled: false });

  test("bad input shows field errors beside the fields, with the values kept", async ({ page }) => {
    await page.goto("/sign-up");
    await page.getByLabel("Your name").fill("Kit");
    await page.getByLabel("E-mail address").fill("kit-at-nowhere");
    await page.getByLabel("Password", { exact: true }).fill("short");
    await page.getByLabel("Repeat the password").fill("different");
    const [response] = await Promise.all([page.waitForResponse((r) => r.url().endsWith("/sign-up") && r.request().method() === "POST"), page.getByRole("button", { name: "Create account" }).click()]);
    expect(response.status()).toBe(400);
    await expect(page.getByLabel("E-mail address")).toHaveValue("kit-at-nowhere");
    await expect(page.getByLabel("E-mail address")).toHaveAttribute("aria-invalid", "true");
    await expect(page.getByText("Enter a valid e-mail address")).toBeVisible();
    await expect(page.getByText("Use at least 10 characters")).toBeVisible();
    await expect(page.getByText("The two passwords differ")).toBeVisible();
    await expect(page.getByLabel("Your name")).toHaveValue("Kit");
  });

  test("an unknown address gets the 404 page in the product's design", async ({ page }) => {
    const res = await page.goto("/no-such-place");
    expect(res?.status()).toBe(404);
    await expect(page.getByRole("heading", { name: "Page not found" })).toBeVisible();
  });
});
