// The core notice flow in Chromium: an officer drafts a notice by typing ED50 positions, the
// harbourmaster publishes it, the public board (map and list) shows it, the position table's
// WGS 84 values agree with the position engine, and after cancellation the board shows it as
// cancelled. Demo accounts from seeds/demo-accounts.json (invented people).
import { expect, test, type Page } from "@playwright/test";
import { toWgs84 } from "../../app/lib/geo/crs";
import { formatPosition, parsePosition } from "../../app/lib/geo/positions";

const ED50_LINES = ["55 12.20N 003 01.00E", "55 12.20N 003 01.60E", "55 11.90N 003 01.60E", "55 11.90N 003 01.00E"];

async function signIn(page: Page, email: string, password: string) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByTestId("toast")).toContainText("Signed in as");
}

async function mapReady(page: Page) {
  // The OpenLayers chunk loads after hydration and draws into a canvas.
  await expect(page.getByTestId("map").locator("canvas").first()).toBeAttached({ timeout: 15_000 });
}

test("officer drafts in ED50, harbourmaster publishes, the public sees it, then it is cancelled", async ({ browser }) => {
  const title = `Survey buoys laid off Gannet Bank ${Date.now()}`;

  // 1. The officer drafts, typing positions in ED50, with live feedback per line.
  const officer = await (await browser.newContext()).newPage();
  await signIn(officer, "officer@kestrel-sound.example", "skerrow-officer-2026");
  await officer.goto("/staff/notices/new");
  await mapReady(officer);
  await officer.getByLabel("Title (key subject)").fill(title);
  await officer.getByLabel("General type (IHO S-124)").selectOption("special_operations");
  await officer.getByLabel("Locality").fill("Kestrel Sound, Gannet Bank");
  await officer.getByLabel("Text (amplifying remarks)").fill("Four yellow survey buoys laid at the corners of the area. Keep clear.");
  const part = officer.getByTestId("part-0");
  await part.getByLabel("Kind").selectOption("area");
  await part.getByLabel("Datum / grid of the positions").selectOption("EPSG:4230");
  // A bad line first: the feedback names it.
  await part.getByLabel("Positions, one per line").fill([ED50_LINES[0], "55 61.00N 003 01.60E"].join("\n"));
  await expect(officer.getByTestId("part-0-feedback")).toContainText("✗ Line 2: Minutes must be less than 60");
  await part.getByLabel("Positions, one per line").fill(ED50_LINES.join("\n"));
  await expect(officer.getByTestId("part-0-feedback")).toContainText("✓ Line 4");
  await officer.getByRole("button", { name: "Save draft" }).click();
  await expect(officer.getByTestId("toast")).toContainText("Draft saved.");
  await expect(officer).toHaveURL(/\/staff\/notices\/\d+\/edit$/);
  const id = Number(/\/staff\/notices\/(\d+)\/edit/.exec(officer.url())![1]);
  // Officers cannot publish.
  await expect(officer.getByRole("button", { name: "Save and publish" })).toHaveCount(0);

  // 2. The harbourmaster publishes it.
  const hmContext = await browser.newContext();
  const hm = await hmContext.newPage();
  await signIn(hm, "harbourmaster@kestrel-sound.example", "skerrow-hm-2026");
  await hm.goto(`/staff/notices/${id}/edit`);
  await mapReady(hm);
  await hm.getByRole("button", { name: "Save and publish" }).click();
  await expect(hm).toHaveURL(new RegExp(`/notices/${id}$`));
  await expect(hm.getByTestId("toast")).toContainText(/Published KSH \d{4}\/\d{3}/);
  const series = (await hm.locator("#notice-title").locator("xpath=preceding-sibling::p[1]").textContent())!.trim();
  expect(series).toMatch(/^KSH \d{4}\/\d{3}$/);

  // 3. The public board: the list shows it and the map's extent query returns it.
  const pub = await (await browser.newContext()).newPage();
  const bboxResponse = pub.waitForResponse((r) => r.url().includes("/api/v1/notices?bbox=") && r.status() === 200);
  await pub.goto("/");
  await expect(pub.getByTestId("notice-table").locator(`tr[data-notice-id="${id}"]`)).toContainText(title);
  await mapReady(pub);
  const fc = (await (await bboxResponse).json()) as { features: { id: number }[] };
  expect(fc.features.map((f) => f.id)).toContain(id);

  // 4. The notice page: WGS 84 values agree with the position engine.
  await pub.goto(`/notices/${id}`);
  await expect(pub.getByRole("heading", { name: title })).toBeVisible();
  await expect(pub.getByText("Tidewire informs; it does not replace official charts").first()).toBeVisible();
  const cells = await pub.getByTestId("positions-part-1").getByTestId("wgs84-ddm").allTextContents();
  const expected = ED50_LINES.map((line) => {
    const p = parsePosition(line);
    if (!p.ok) throw new Error(p.error);
    const w = toWgs84("EPSG:4230", { lat: p.lat, lon: p.lon });
    return formatPosition(w.lat, w.lon, "ddm", { decimals: 3 });
  });
  expect(cells).toEqual(expected);
  await expect(pub.getByTestId("broadcast")).toContainText(series);
  await expect(pub.getByTestId("broadcast")).toContainText("IN AREA BOUNDED BY:");
  const gpx = await pub.request.get(`/notices/${id}/gpx`);
  expect(gpx.status()).toBe(200);
  expect(await gpx.text()).toContain("<rtept");

  // 5. The harbourmaster cancels it with a reason; the board shows it as cancelled.
  await hm.goto(`/staff/notices/${id}/edit`);
  await hm.getByRole("button", { name: "Cancel notice" }).click();
  await expect(hm.getByText("Give the reason for the cancellation")).toBeVisible();
  await hm.getByLabel("Reason (published with the cancellation)").fill("Survey completed and buoys recovered.");
  await hm.getByRole("button", { name: "Cancel notice" }).click();
  await expect(hm).toHaveURL(new RegExp(`/notices/${id}$`));
  await expect(hm.getByTestId("notice-state")).toContainText("CANCELLED");

  await pub.goto("/");
  await expect(pub.getByTestId("notice-table").locator(`tr[data-notice-id="${id}"]`)).toHaveCount(0);
  const ended = pub.getByTestId("ended-list").locator(`li[data-notice-id="${id}"]`);
  await expect(ended).toContainText("Cancelled");
  await expect(ended).toContainText("Survey completed and buoys recovered.");
  // Still readable.
  await pub.goto(`/notices/${id}`);
  await expect(pub.getByTestId("notice-state")).toContainText("Reason: Survey completed and buoys recovered.");
});

test.describe("without JavaScript", () => {
  test.use({ javaScriptEnabled: false });

  test("the editor shows a self-crossing area as a field error, with everything typed kept", async ({ page }) => {
    await signInNoJs(page, "officer2@kestrel-sound.example", "skerrow-officer-2026");
    await page.goto("/staff/notices/new");
    await page.getByLabel("Title (key subject)").fill("Crossed area test");
    await page.getByLabel("Text (amplifying remarks)").fill("Text that must survive the error.");
    const bowtie = "55 12.0N 003 01.0E\n55 12.6N 003 02.0E\n55 12.0N 003 02.0E\n55 12.6N 003 01.0E";
    await page.getByLabel("Positions, one per line").fill(bowtie);
    const [response] = await Promise.all([
      page.waitForResponse((r) => r.url().includes("/staff/notices/new") && r.request().method() === "POST"),
      page.getByRole("button", { name: "Save draft" }).click(),
    ]);
    expect(response.status()).toBe(400);
    await expect(page.getByText("The area's edges cross each other")).toBeVisible();
    await expect(page.getByLabel("Positions, one per line")).toHaveValue(bowtie);
    await expect(page.getByLabel("Positions, one per line")).toHaveAttribute("aria-invalid", "true");
    await expect(page.getByLabel("Title (key subject)")).toHaveValue("Crossed area test");
    await expect(page.getByLabel("Text (amplifying remarks)")).toHaveValue("Text that must survive the error.");
  });
});

async function signInNoJs(page: Page, email: string, password: string) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).not.toHaveURL(/\/sign-in/);
}
