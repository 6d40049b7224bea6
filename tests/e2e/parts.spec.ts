import { asRole, expect, screenshot, signIn, test } from "./support";

test("the shop owner adds a part, books a delivery, counts the shelf, edits and removes it", async ({
  page,
}) => {
  const number = `E2E-PV-${Date.now().toString(36).toUpperCase()}`;
  await signIn(page, "shopManager");
  await page.goto("/stocking");
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Parts" }).click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Parts");
  await expect(
    page.getByRole("table", { name: "Parts list" }).getByRole("row").nth(1),
  ).toBeVisible();

  const add = page.getByRole("form", { name: "Add a part" });
  // Bad input first: clear messages by the fields, nothing added.
  await add.getByLabel("Part number").fill("=HYPERLINK(1)");
  await add.getByLabel("Description").fill("Purge valve (test)");
  await add.getByLabel("Unit cost").fill("1,5");
  await add.getByRole("button", { name: "Add part" }).click();
  await expect(add.getByRole("alert")).toHaveText("Please correct the fields marked below.");
  await expect(add.getByText(/starting with a letter or digit/)).toBeVisible();
  await expect(add.getByText("Enter an amount like 12.50.")).toBeVisible();

  await add.getByLabel("Part number").fill(number);
  await add.getByLabel("Unit cost").fill("42.50");
  await add.getByLabel("Lead time (days)").fill("5");
  await add.getByLabel("On hand").fill("2");
  await add.getByLabel("Component").selectOption({ index: 1 });
  await add.getByRole("button", { name: "Add part" }).click();
  await expect(add.getByRole("status")).toHaveText(`Part ${number} added.`);
  // The same number again is refused.
  await add.getByLabel("Part number").fill(number.toLowerCase());
  await add.getByLabel("Description").fill("Again");
  await add.getByRole("button", { name: "Add part" }).click();
  await expect(add.getByRole("alert")).toHaveText(
    `Part ${number.toLowerCase()} is already on the list.`,
  );

  await page.getByLabel("Search parts").fill(number);
  await page.getByRole("button", { name: "Search" }).click();
  await page.getByRole("link", { name: number }).click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(`Part ${number}`);
  await expect(page.getByTestId("on-hand")).toHaveText("2");

  const receive = page.getByRole("form", { name: "Quantity received" });
  await receive.getByLabel("Quantity received").fill("5");
  await receive.getByRole("button", { name: "Book the delivery" }).click();
  await expect(receive.getByRole("status")).toHaveText("5 received; 7 on hand.");
  await expect(page.getByTestId("on-hand")).toHaveText("7");

  const count = page.getByRole("form", { name: "Quantity counted" });
  await count.getByLabel("Quantity counted").fill("3");
  await count.getByRole("button", { name: "Record the count" }).click();
  await expect(page.getByTestId("on-hand")).toHaveText("3");
  await expect(
    page.getByRole("list", { name: "Recent changes" }).getByRole("listitem").first(),
  ).toContainText("counted 3 on hand (the list said 7)");

  const details = page.getByRole("form", { name: "Part details" });
  await details.getByLabel("Lead time (days)").fill("9");
  await details.getByRole("button", { name: "Save" }).click();
  await expect(details.getByRole("status")).toHaveText("Saved.");
  await expect(page.getByText("9 days")).toBeVisible();
  await screenshot(page, "part");

  // The stocking plan works with the list as it is now.
  const plan = (await (await page.request.get("/api/stocking")).json()) as {
    parts: { partNumber: string; onHand: number; leadTimeDays: number | null }[];
  };
  expect(plan.parts.find((p) => p.partNumber === number)).toMatchObject({
    onHand: 3,
    leadTimeDays: 9,
  });

  const remove = page.getByRole("form", { name: "Remove the part" });
  await remove.getByRole("button", { name: "Remove" }).click();
  await expect(remove.getByText("Tick the box to confirm.")).toBeVisible();
  await remove.getByRole("checkbox").check();
  await remove.getByRole("button", { name: "Remove" }).click();
  await page.waitForURL(/\/parts\?removed=1/);
  await expect(page.getByText("The part was removed from the list.")).toBeVisible();
  await page.goto(`/parts?q=${encodeURIComponent(number)}`);
  await expect(page.getByText("No part matches this search.")).toBeVisible();
  await screenshot(page, "parts");
});

test("a technician and a viewer cannot open the parts list", async ({ browser, baseURL }) => {
  for (const role of ["technician", "viewer"] as const) {
    await asRole(browser, baseURL, role, async (page) => {
      expect((await page.goto("/parts"))?.status(), role).toBe(403);
      expect((await page.goto("/parts/1"))?.status(), role).toBe(403);
    });
  }
});
