// A guest reports buoy KS5 from a radar range and bearing with a photo; the officer's queue
// shows it as off station; the officer drafts a notice from it; the harbourmaster publishes;
// the reporter's e-mails (confirmation, then closure by the notice) arrive in the SMTP fake.
import { expect, test, type Browser, type Page } from "@playwright/test";
import { direct, inverse } from "../../app/lib/geo/geodesy";
import { formatPosition } from "../../app/lib/geo/positions";
import { jpegWithGps } from "../support/images";
import { linkIn, waitForMail } from "../support/mail";

async function signIn(browser: Browser, email: string, password: string): Promise<Page> {
  const context = await browser.newContext();
  const page = await context.newPage();
  await page.goto("/sign-in");
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).not.toHaveURL(/\/sign-in/);
  return page;
}

/** A radar fix of a mark 0.08 M (148.16 m) east of `charted`, from 0.6 M south-west of it. */
function radarFix(charted: { lat: number; lon: number }) {
  const real = direct(charted.lat, charted.lon, 90, 0.08 * 1852);
  const own = direct(real.lat, real.lon, 225, 0.6 * 1852);
  const inv = inverse(own.lat, own.lon, real.lat, real.lon);
  return { own: formatPosition(own.lat, own.lon, "ddm", { decimals: 4 }), rangeNm: (inv.distanceM / 1852).toFixed(4), bearingDeg: inv.initialBearingTrueDeg.toFixed(2) };
}

async function chartedOf(request: import("@playwright/test").APIRequestContext, code: string) {
  const aids = await (await request.get("/api/v1/aids")).json();
  const f = aids.features.find((x: { id: string }) => x.id === code);
  return { lat: f.geometry.coordinates[1] as number, lon: f.geometry.coordinates[0] as number, id: f.properties };
}

test("guest radar report with a photo → off station in the queue → notice drafted and published → reporter e-mailed", async ({ browser, request }) => {
  test.setTimeout(120_000);
  const fix = radarFix(await chartedOf(request, "KS5"));
  const email = `guest-${Date.now()}@boats.example`;

  // The guest's report.
  const guest = await (await browser.newContext()).newPage();
  await guest.goto("/report?aid=KS5");
  await expect(guest.getByText("If you chose radar:")).toBeHidden(); // hydrated: only the chosen method shows
  await expect(guest.getByTestId("aid-facts")).toContainText("28.3 m"); // √(30² − 10²)
  // The photo goes up at once (XHR with a progress bar); its EXIF GPS and time are offered.
  await guest.locator("#photos").setInputFiles({ name: "ks5.jpg", mimeType: "image/jpeg", buffer: await jpegWithGps({ width: 1600, height: 1200, lat: 55.1921, lon: 3.0123 }) });
  await expect(guest.getByTestId("uploaded-photo")).toHaveCount(1);
  await expect(guest.getByTestId("uploaded-photo")).toContainText("GPS tag");
  await guest.getByRole("button", { name: "use as own position" }).click();
  await expect(guest.locator('input[name="radar.ownPosition"]')).toHaveValue(formatPosition(55.1921, 3.0123, "ddm", { decimals: 3 }));
  // The photo was taken on 30 Nov 2026 14:05 (its EXIF time), long before "now": flagged.
  await expect(guest.getByTestId("photo-flags")).toContainText("before the observation time given");
  await guest.locator('input[name="radar.ownPosition"]').fill(fix.own);
  await guest.locator('input[name="radar.rangeNm"]').fill(fix.rangeNm);
  await guest.locator('input[name="radar.bearingDeg"]').fill(fix.bearingDeg);
  await guest.locator('input[name="radar.rangeScaleNm"]').fill("1.5");
  const preview = guest.getByTestId("assessment-preview");
  await expect(preview).toContainText("Off station");
  await expect(preview.getByTestId("displacement")).toContainText(/^14[78] m \(0\.080 M\) 090°T/);
  await guest.getByLabel("Your e-mail address").fill(email);
  await guest.getByLabel("Your name (optional)").fill("Morven Gask");
  await guest.getByLabel("Vessel (optional)").fill("FV Bright Dawn");
  await guest.getByRole("button", { name: "Send report" }).click();
  await expect(guest).toHaveURL(/\/reports\/\d+\?key=/);
  await expect(guest.getByTestId("report-status")).toHaveText("New");
  const heading = (await guest.getByRole("heading", { level: 1 }).textContent()) ?? "";
  const reference = /R-\d{4}/.exec(heading)![0];
  await expect(guest.getByRole("img", { name: new RegExp(`Photo 1 of ${reference}`) })).toBeVisible();

  const received = await waitForMail({ to: email, subject: `Report ${reference} received`, timeoutMs: 20_000 });
  expect(received.text).toMatch(/Off station/);
  const follow = linkIn(received, `/reports/`);
  expect(follow).toMatch(/\?key=/);

  // The officer's queue, the per-aid page, the draft notice.
  const officer = await signIn(browser, "officer@kestrel-sound.example", "skerrow-officer-2026");
  await officer.goto("/staff/reports");
  const row = officer.getByTestId(`queue-row-${reference}`);
  await expect(row).toContainText("Off station");
  await row.getByRole("link", { name: "Triage KS5" }).click();
  await expect(officer.getByTestId("combined-estimate")).toContainText("Off station");
  await officer.getByRole("button", { name: "Draft a notice from these reports" }).click();
  await expect(officer).toHaveURL(/\/staff\/notices\/\d+\/edit/);
  const editUrl = officer.url();
  await expect(officer.getByLabel("Title")).toHaveValue("KS5 buoy off position");

  // The harbourmaster publishes it.
  const hm = await signIn(browser, "harbourmaster@kestrel-sound.example", "skerrow-hm-2026");
  await hm.goto(editUrl);
  await hm.getByRole("button", { name: "Save and publish" }).click();
  await expect(hm).toHaveURL(/\/notices\/\d+$/);
  await expect(hm.getByTestId("toast")).toContainText(/Published KSH \d{4}\/\d{3}/);

  // The reporter hears that the report is closed by the notice.
  const closed = await waitForMail({ to: email, subject: new RegExp(`Report ${reference} \\(KS5\\): closed`), timeoutMs: 40_000 });
  expect(closed.text).toMatch(/navigational warning has been published/);
  await guest.goto(follow.replace(/^https?:\/\/[^/]+/, ""));
  await expect(guest.getByTestId("report-status")).toHaveText("Closed");
});

test.describe("without JavaScript", () => {
  test.use({ javaScriptEnabled: false });

  test("the report form works as a multipart POST with a photo; bad input is shown beside the field with the text kept", async ({ page, request }) => {
    const fix = radarFix(await chartedOf(request, "KS7"));
    await page.goto("/report?aid=KS7");
    await page.locator('input[name="radar.ownPosition"]').fill(fix.own);
    await page.locator('input[name="radar.rangeNm"]').fill("9");
    await page.locator('input[name="radar.bearingDeg"]').fill(fix.bearingDeg);
    await page.locator('input[name="radar.rangeScaleNm"]').fill("1.5");
    await page.locator('textarea[name="remarks"]').fill("Seen leaning after the gale");
    await page.locator('input[name="reporterEmail"]').fill(`nojs-${Date.now()}@boats.example`);
    await page.getByRole("button", { name: "Send report" }).click();
    await expect(page.getByText("The range (9 M) is beyond the range scale in use (1.5 M)")).toBeVisible();
    await expect(page.locator('textarea[name="remarks"]')).toHaveValue("Seen leaning after the gale");
    await page.locator('input[name="radar.rangeNm"]').fill(fix.rangeNm);
    await page.locator("#photos").setInputFiles({ name: "ks7.jpg", mimeType: "image/jpeg", buffer: await jpegWithGps({ width: 800, height: 600 }) });
    await page.getByRole("button", { name: "Send report" }).click();
    await expect(page).toHaveURL(/\/reports\/\d+\?key=/);
    await expect(page.getByText("Off station").first()).toBeVisible();
    await expect(page.getByRole("img", { name: /Photo 1 of R-\d{4}/ })).toBeVisible();
  });
});
