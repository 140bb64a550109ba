// The board's map has a keyboard and screen-reader alternative: the map region is named and
// points to the table; the table lists exactly the notices in force (the same set the map and
// the API show); every notice in it is reachable with the Tab key, and the map traps no focus.
import { expect, test } from "@playwright/test";
import { qdb } from "../../scripts/quality/db";

test("the notices on the map are the notices in the table, reachable by keyboard", async ({ page, request }) => {
  const inForce: Array<{ id: number; series_code: string; year: number; number: number; title: string }> = await qdb()("notices")
    .where({ status: "in_force" })
    .select("id", "series_code", "year", "number", "title");
  expect(inForce.length, "the demo seed should have notices in force").toBeGreaterThan(0);
  // The API's answer for the same question (what the map layer is built from).
  const api = await (await request.get("/api/v1/notices?status=in_force&limit=500")).json();
  const apiIds = new Set<number>((api.features ?? api.notices ?? api.items ?? []).map((f: { id?: number; properties?: { id?: number } }) => Number(f.properties?.id ?? f.id)));
  expect([...apiIds].sort()).toEqual(inForce.map((n) => n.id).sort());

  await page.goto("/");
  await page.waitForLoadState("networkidle");
  const map = page.getByRole("region", { name: /map/i });
  await expect(map).toBeVisible();
  await expect(map).toHaveAccessibleName(/listed in the table/i);
  const table = page.getByTestId("notice-table").first();
  await expect(table).toBeVisible();
  // Every notice in force is a link in the table (by its page URL).
  for (const n of inForce) await expect(table.locator(`a[href="/notices/${n.id}"]`).first(), `notice ${n.id} ${n.title}`).toBeAttached();

  // Keyboard: Tab from the top reaches each notice link in the table; focus always moves on.
  const wanted = new Set(inForce.map((n) => `/notices/${n.id}`));
  const reached = new Set<string>();
  let previous = "";
  let stuck = 0;
  await page.locator("body").click({ position: { x: 1, y: 1 } });
  for (let i = 0; i < 400 && reached.size < wanted.size; i++) {
    await page.keyboard.press("Tab");
    const focus = await page.evaluate(() => {
      const el = document.activeElement as HTMLElement | null;
      const inTable = !!el?.closest('[data-testid="notice-table"]');
      return { key: el ? `${el.tagName}#${el.id}.${el.getAttribute("href") ?? ""}.${el.textContent?.slice(0, 30)}` : "", href: el?.getAttribute("href") ?? "", inTable };
    });
    if (focus.inTable && wanted.has(focus.href)) reached.add(focus.href);
    stuck = focus.key === previous ? stuck + 1 : 0;
    expect(stuck, `focus stuck on ${focus.key}`).toBeLessThan(3);
    previous = focus.key;
  }
  expect([...wanted].filter((h) => !reached.has(h)), "notice links not reachable with Tab").toEqual([]);
});
