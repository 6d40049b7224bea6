import { expect, screenshot, signIn, test } from "./support";

/** An expected count in words: below one as a chance with its range as chances. */
const OUTLOOK =
  /^((about an? [\d.]+%|under a 0\.1%) chance of a failure(, likely (between [\d.]+% and [\d.]+%|under [\d.]+%))?|about [\d.,]+ failures? \(likely (under )?[\d.,]+ to [\d.,]+\))$/;

test("the fleet manager lists vehicles at risk, exports them, and works a campaign list", async ({
  page,
}) => {
  await signIn(page, "manager");
  await page.goto("/at-risk");
  const table = page.getByRole("table", { name: "Vehicles at risk" });
  const rows = table.getByRole("row");
  await expect(rows.nth(1)).toBeVisible();
  await expect(table).toContainText("Harsh or flaring shifts past 75,000 mi");
  await screenshot(page, "at-risk");

  const csv = await page.request.get(
    (await page.getByRole("link", { name: "Download CSV" }).getAttribute("href")) ?? "",
  );
  const lines = (await csv.text())
    .replace(/^\uFEFF/, "")
    .trim()
    .split("\r\n");
  expect(lines[0]).toBe(
    "unit_number,vin,cohort,odometer_mi,why,range_from_mi,range_to_mi,miles_to_range,expected_failures,expected_low,expected_high,fix_cost",
  );
  expect(lines.length).toBeGreaterThan(1);
  // Each expected count in words with its range, on the page; the exact figures one click away
  // and in the file (low ≤ expected ≤ high).
  await expect(table.getByTestId("expected").first()).toHaveText(OUTLOOK);
  await expect(table).not.toContainText("expected failures (");
  const figures = rows.nth(1).locator("[data-figure-details]");
  await figures.locator("summary").click();
  await expect(figures).toContainText(/Expected failures\s*[\d.]+/);
  await expect(figures).toContainText(/95% interval\s*[\d.]+ to [\d.]+/);
  for (const line of lines.slice(1, 20)) {
    const cells = line.split(",");
    const [expected, low, high] = cells.slice(-4, -1).map(Number);
    expect(low).toBeLessThanOrEqual(expected!);
    expect(high).toBeGreaterThanOrEqual(expected!);
  }

  // Nothing ticked: a clear message, nothing created.
  const form = page.getByRole("form", { name: "Add to a campaign list" });
  await form.getByLabel("New list name").fill("Ground straps before winter");
  await form.getByRole("button", { name: "Add ticked vehicles" }).click();
  await expect(form.getByRole("alert")).toContainText("Tick at least one vehicle");

  await rows.nth(1).getByRole("checkbox").check();
  await rows.nth(2).getByRole("checkbox").check();
  await form.getByRole("button", { name: "Add ticked vehicles" }).click();
  await expect(form.getByRole("status")).toContainText(/\d vehicles? added/);
  await page.reload();
  await page.getByRole("link", { name: "Ground straps before winter" }).click();
  await expect(page).toHaveURL(/\/campaigns\/\d+$/);
  const done = page.getByTestId("campaign-done");
  await expect(done.first()).toHaveText("not done");
  await page
    .getByRole("button", { name: /^Mark done:/ })
    .first()
    .click();
  await expect(done.first()).toContainText("done ");
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Ground straps before winter");
  await screenshot(page, "campaign");
});

test("a technician cannot open the watch-list or the campaign lists", async ({ page }) => {
  await signIn(page, "technician");
  expect((await page.goto("/at-risk"))?.status()).toBe(403);
  expect((await page.request.get("/api/at-risk")).status()).toBe(403);
});

test("home: a manager sees the vehicles most at risk; a technician the lookup; a viewer the known issues", async ({
  browser,
  baseURL,
}) => {
  const manager = await browser.newContext({ baseURL });
  const page = await manager.newPage();
  await signIn(page, "manager");
  await page.goto("/");
  const list = page.getByRole("list", { name: "Vehicles most at risk" });
  await expect(list.getByRole("listitem").first()).toBeVisible();
  const shown = await list.getByRole("listitem").count();
  expect(shown).toBeGreaterThan(0);
  expect(shown).toBeLessThanOrEqual(5);
  // The same first vehicles as the watch-list's JSON, most expected failures first.
  const api = (await (await page.request.get("/api/at-risk?limit=5")).json()) as {
    rows: {
      vehicleId: number;
      expected: number;
      expectedLower: number | null;
      expectedUpper: number | null;
    }[];
    total: number;
    confidence: number;
  };
  expect(api.rows.length).toBe(shown);
  expect(api.total).toBeGreaterThanOrEqual(shown);
  for (let i = 1; i < api.rows.length; i++) {
    expect(api.rows[i - 1]!.expected).toBeGreaterThanOrEqual(api.rows[i]!.expected);
  }
  await expect(list.getByRole("link").first()).toHaveAttribute(
    "href",
    `/vehicles/${api.rows[0]!.vehicleId}`,
  );
  // Each in words with its range, as the watch-list gives it; the level is said once.
  const [top] = api.rows;
  expect(top!.expectedLower).not.toBeNull();
  await expect(list.getByRole("listitem").first().getByTestId("expected")).toHaveText(OUTLOOK);
  await expect(list.getByRole("listitem").first()).toContainText(/likely/);
  await expect(
    page
      .getByRole("region", { name: "Vehicles at risk" })
      .getByText(`${Math.round(api.confidence * 100)}% confidence`),
  ).toBeVisible();
  expect((await page.request.get("/api/at-risk?limit=0")).status()).toBe(400);

  // The new signals and top failures: faults by name, ratios in words, the p-value one click away.
  for (const name of [/^New signals \(\d+\)$/, "Top recurring failures"]) {
    const panel = page.getByRole("region", { name });
    const first = panel.getByRole("listitem").first();
    await expect(first).toContainText(/\d+ repairs?, (about|no repairs of this)/);
    await expect(first).toContainText(/the rest of the fleet/);
    await expect(first.getByRole("link")).not.toHaveText(/[a-z]+-[a-z-]+\/[a-z]/);
    const figures = first.locator("[data-figure-details]");
    await expect(figures.getByText("p (exact test of the ratio)")).toBeHidden();
    await figures.locator("summary").click();
    await expect(figures.getByText("p (exact test of the ratio)")).toBeVisible();
    await expect(figures).not.toContainText(/\de-\d|∞/);
  }
  await manager.close();

  for (const [role, link] of [
    ["technician", "Look up a vehicle →"],
    ["viewer", "Known issues →"],
  ] as const) {
    const context = await browser.newContext({ baseURL });
    const other = await context.newPage();
    await signIn(other, role);
    await other.goto("/");
    await expect(other.getByRole("link", { name: link })).toBeVisible();
    await expect(other.getByRole("list", { name: "Vehicles most at risk" })).toHaveCount(0);
    await context.close();
  }
});
