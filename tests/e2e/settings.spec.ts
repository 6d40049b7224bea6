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
