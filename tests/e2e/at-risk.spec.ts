import { expect, screenshot, signIn, test } from "./support";

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
    "unit_number,vin,cohort,odometer_mi,why,range_from_mi,range_to_mi,miles_to_range,expected_failures,fix_cost",
  );
  expect(lines.length).toBeGreaterThan(1);

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
