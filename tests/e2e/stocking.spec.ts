import { expect, screenshot, signIn, test } from "./support";

test("the shop owner plans stock and exports the purchase list", async ({ page }) => {
  await signIn(page, "shopManager");
  await page.goto("/stocking");
  const table = page.getByRole("table", { name: "Stocking plan" });
  await expect(table.getByRole("row").nth(1)).toBeVisible();
  const reorderAt95 = Number(await page.getByTestId("stock-parts-to-reorder").textContent());
  expect(reorderAt95).toBeGreaterThan(0);
  await screenshot(page, "stocking");
  // Headers say what they mean; each part says which kind of work its demand comes from.
  const headers = await table.getByRole("columnheader").allTextContents();
  expect(headers).toContain("Expected shortfall without reorder");
  expect(headers).toContain("Demand from");
  expect(headers).not.toContain("Short if not");
  await expect(table.getByTestId("demand-from").first()).toHaveText(
    /^(Scheduled service|Wear|Failure)(, (Scheduled service|Wear|Failure)){0,2}$/,
  );
  // Each demand with its range from the rates' uncertainty, in words, as the JSON gives it; the
  // method one click away.
  await expect(table.getByTestId("demand-interval").first()).toHaveText(
    /^likely (under )?[\d.,]+ to [\d.,]+$/,
  );
  const details = page.locator("[data-figure-details]").first();
  await details.locator("summary").click();
  await expect(details).toContainText("Poisson quantile");
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
    "part_number,description,component,abc,expected_demand,demand_low,demand_high,period_days,stock_level,on_hand,reorder,unit_cost,reorder_value,expected_shortfall_on_hand,demand_kind",
  );
  expect(lines.length - 1).toBe(reorderAt99);
  // A part to reorder has demand, and the kinds of work behind it, largest first.
  for (const line of lines.slice(1)) {
    expect(line.split(",").at(-1)).toMatch(
      /^(service|wear|failure)(\+(service|wear|failure)){0,2}$/,
    );
  }

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
