import { expect, signIn, test } from "./support";

test("switching the distance unit converts the distances shown, without saving", async ({
  page,
}) => {
  await signIn(page, "admin");
  await page.goto("/settings");
  const unit = page.getByLabel("Distances in");
  const from = (await unit.inputValue()) as "mi" | "km";
  const to = from === "mi" ? "km" : "mi";
  const band = page.getByLabel(`Mileage band width (${from})`);
  const before = Number(await band.inputValue());
  expect(before).toBeGreaterThan(0);
  await unit.selectOption(to);
  // 1 mi = 1.609344 km (NIST SP 811), shown to two significant figures.
  const converted = page.getByLabel(`Mileage band width (${to})`);
  const expected = Number((to === "km" ? before * 1.609344 : before / 1.609344).toPrecision(2));
  await expect(converted).toHaveValue(String(expected));
  await expect(page.getByLabel(`Post-refuel window (${to})`)).toBeVisible();
  // And back: the same round number as before.
  await unit.selectOption(from);
  await expect(page.getByLabel(`Mileage band width (${from})`)).toHaveValue(String(before));
});

test("a distance typed with thousands separators saves as that number; an empty one is refused", async ({
  page,
}) => {
  await signIn(page, "admin");
  await page.goto("/settings");
  const unit = (await page.getByLabel("Distances in").inputValue()) as "mi" | "km";
  const band = page.getByLabel(`Mileage band width (${unit})`);
  const before = Number(await band.inputValue());
  expect(before).toBeGreaterThanOrEqual(1000);

  await band.fill("");
  await page.getByRole("button", { name: "Save settings" }).click();
  await expect(page.locator("#bandWidth-error")).toHaveText("Give the mileage band width.");

  // The same value as before, as people write it ("25,000"): nothing changes but the form is
  // accepted.
  await band.fill(before.toLocaleString("en-GB"));
  expect(await band.inputValue()).toContain(",");
  await page.getByRole("button", { name: "Save settings" }).click();
  await expect(page.getByText("Settings saved.", { exact: true })).toBeVisible();
  await page.reload();
  await expect(page.getByLabel(`Mileage band width (${unit})`)).toHaveValue(String(before));
});

test("an admin sets a component's kind on Settings → Components; it is audited and can be set back", async ({
  page,
}) => {
  await signIn(page, "admin");
  await page.goto("/settings");
  await page.getByRole("link", { name: "Components →" }).click();
  await expect(page.getByRole("heading", { name: "Components", level: 1 })).toBeVisible();
  await expect(page.getByText("Scheduled maintenance. Never counted as a failure")).toBeVisible();
  // Wheel alignment has no repair lines in the demo: changing it moves nothing in the statistics.
  const kind = page.getByLabel("Kind of Wheel alignment");
  await expect(kind).toHaveValue("service");
  await kind.selectOption("failure");
  const row = page.getByRole("row", { name: /Wheel alignment/ });
  await row.getByRole("button", { name: "Save" }).click();
  await expect(row.getByRole("status")).toHaveText(
    "Saved as failure. None of your repair lines changed kind.",
  );
  await page.reload();
  await expect(page.getByLabel("Kind of Wheel alignment")).toHaveValue("failure");
  await expect(page.getByText(/Your choice; Recurra.s default is scheduled service/)).toBeVisible();
  await page.goto("/settings/audit");
  await expect(
    page.getByText("component.kind · component tyres-wheels/alignment").first(),
  ).toBeVisible();
  await page.goto("/settings/components");
  await page.getByLabel("Kind of Wheel alignment").selectOption("service");
  await page
    .getByRole("row", { name: /Wheel alignment/ })
    .getByRole("button", { name: "Save" })
    .click();
  await expect(
    page.getByRole("row", { name: /Wheel alignment/ }).getByRole("status"),
  ).toContainText("Saved as scheduled service");
});

test("a manager may not open Settings → Components", async ({ page }) => {
  await signIn(page, "manager");
  const response = await page.goto("/settings/components");
  expect(response?.status()).toBe(403);
});
