import { expect, screenshot, signIn, test } from "./support";

test("the shell works at tablet width", async ({ page }) => {
  await signIn(page, "technician");
  await expect(page.getByRole("navigation", { name: "Main" })).toBeVisible();
  // Nothing overflows the viewport sideways.
  const overflow = await page.evaluate(
    () => document.documentElement.scrollWidth - window.innerWidth,
  );
  expect(overflow).toBeLessThanOrEqual(0);
  await page
    .getByRole("navigation", { name: "Main" })
    .getByRole("link", { name: "Vehicles" })
    .click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Vehicles");
  await screenshot(page, "tablet-vehicles");
});
