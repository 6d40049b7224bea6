import { expect, screenshot, signIn, test } from "./support";

test("the shop owner plans stock and exports the purchase list", async ({ page }) => {
  await signIn(page, "shopManager");
  await page.goto("/stocking");
  const table = page.getByRole("table", { name: "Stocking plan" });
  await expect(table.getByRole("row").nth(1)).toBeVisible();
  const reorderAt95 = Number(await page.getByTestId("stock-parts-to-reorder").textContent());
  expect(reorderAt95).toBeGreaterThan(0);
  await screenshot(page, "stocking");
  // Each demand with its range from the rates' uncertainty, as the JSON gives it.
  await expect(table.getByTestId("demand-interval").first()).toHaveText(/^[\d.,]+–[\d.,]+$/);
  const json = (await (await page.request.get("/api/stocking")).json()) as {
    parts: { expectedDemand: number; demandLower: number | null; demandUpper: number | null }[];
  };
  for (const p of json.parts.filter((x) => x.expectedDemand > 0)) {
    expect(p.demandLower).toBeLessThanOrEqual(p.expectedDemand + 1e-9);
    expect(p.demandUpper).toBeGreaterThanOrEqual(p.expectedDemand - 1e-9);
  }

  // A higher service level and the cautious rates never ask for fewer parts.
  const form = page.getByRole("form", { name: "Plan settings" });
  await form.getByLabel("Service level").selectOption("0.99");
  await form.getByLabel(/Cautious/).check();
  await form.getByRole("button", { name: "Plan" }).click();
  await expect(page).toHaveURL(/serviceLevel=0\.99.*cautious=1/);
  // Cautious rates are already an upper end: no range under the demand.
  await expect(table.getByTestId("demand-interval")).toHaveCount(0);
  const reorderAt99 = Number(await page.getByTestId("stock-parts-to-reorder").textContent());
  expect(reorderAt99).toBeGreaterThanOrEqual(reorderAt95);

  const href = await page
    .getByRole("link", { name: "Download purchase list (CSV)" })
    .getAttribute("href");
  const csv = await page.request.get(href ?? "");
  expect(csv.headers()["content-type"]).toContain("text/csv");
  const lines = (await csv.text())
    .replace(/^\uFEFF/, "")
    .trim()
    .split("\r\n");
  expect(lines[0]).toBe(
    "part_number,description,component,abc,expected_demand,demand_low,demand_high,period_days,stock_level,on_hand,reorder,unit_cost,reorder_value,expected_shortfall_on_hand",
  );
  expect(lines.length - 1).toBe(reorderAt99);

  // A bad setting is answered with a clear message, never a crash.
  const bad = await page.request.get("/api/stocking?serviceLevel=0.5");
  expect(bad.status()).toBe(400);
  expect((await bad.json()).error).toMatch(/Choose 80%/);
  // The page itself shows the reason and plans with the defaults (95%).
  await page.goto("/stocking?serviceLevel=0.5&serviceLevel=0.99");
  await expect(page.getByRole("alert").filter({ hasText: "showing the defaults" })).toHaveText(
    /Choose 80%.*showing the defaults/,
  );
  await expect(form.getByLabel("Service level")).toHaveValue("0.95");
  expect(Number(await page.getByTestId("stock-parts-to-reorder").textContent())).toBe(reorderAt95);
});

test("a technician cannot open the stocking plan", async ({ page }) => {
  await signIn(page, "technician");
  expect((await page.goto("/stocking"))?.status()).toBe(403);
  expect((await page.request.get("/api/stocking")).status()).toBe(403);
});
