import { expect, screenshot, signIn, test } from "./support";

test("fleet manager: the planted Kestrel K2 cohort tops the refuel analysis; open one of its vehicles", async ({
  page,
}) => {
  await signIn(page, "manager");
  await page
    .getByRole("navigation", { name: "Main" })
    .getByRole("link", { name: "Refuel analysis" })
    .click();
  await expect(page.getByRole("heading", { level: 1, name: "Refuel analysis" })).toBeVisible();

  const cohorts = page.getByTestId("refuel-cohorts");
  const first = cohorts.locator("tbody tr").first();
  await expect(first.getByRole("rowheader")).toHaveText("Aurel Kestrel K2");
  await expect(first).toHaveClass(/bg-sea-50/); // the histogram shows this cohort
  await expect(first.getByRole("link", { name: /refuel/i })).toBeVisible(); // its known issue
  // Its result in words first; the p-value, the method and the exact interval one click away.
  await expect(first).toContainText(
    /about [\d.,]+ times what chance predicts, at least [\d.,]+ times/,
  );
  const details = first.locator("[data-figure-details]");
  await expect(details.getByText("p (one-sided exact test)")).toBeHidden();
  await details.locator("summary").click();
  await expect(details.getByText("p (one-sided exact test)")).toBeVisible();
  await expect(details).toContainText(/95% interval/);
  // No file references, no infinity, no exponent form anywhere on the page.
  const text = (await page.locator("main").textContent()) ?? "";
  expect(text).not.toContain("statistics.md");
  expect(text).not.toContain("∞");
  expect(text).not.toMatch(/\de-\d/);

  const histogram = page.getByTestId("refuel-histogram");
  await expect(histogram.locator("svg").first()).toBeVisible();
  await expect(histogram.getByRole("img")).toHaveAttribute("aria-label", /Aurel Kestrel K2/);
  await screenshot(page, "refuel-analysis");

  const vehicles = page.getByTestId("refuel-vehicles");
  const topVehicle = vehicles.locator("tbody tr").first();
  await expect(topVehicle).toContainText("Kestrel K2");
  const link = topVehicle.getByRole("link").first();
  const name = (await link.textContent())?.trim() ?? "";
  await link.click();
  await page.waitForURL(/\/vehicles\/\d+$/);
  await expect(page.getByRole("heading", { level: 1 })).toContainText("Aurel Kestrel");
  await expect(page.getByText(name).first()).toBeVisible();
  await screenshot(page, "refuel-vehicle");
});

test("refuel settings: a bad window says so and falls back to the default", async ({ page }) => {
  await signIn(page, "viewer");
  await page.goto("/refuel?window=abc");
  await expect(page.getByText("The window must be a number")).toBeVisible();
  await expect(page.getByTestId("refuel-cohorts")).toBeVisible();
});

test("shop manager: comeback rates with intervals per technician, and the CSV export", async ({
  page,
}) => {
  await signIn(page, "shopManager");
  await page
    .getByRole("navigation", { name: "Main" })
    .getByRole("link", { name: "Comebacks" })
    .click();
  await expect(page.getByRole("heading", { level: 1, name: "Comebacks" })).toBeVisible();
  await page.getByRole("link", { name: "Per technician" }).click();
  await page.waitForURL(/view=technician/);
  const table = page.getByTestId("comeback-rates-technician");
  await expect(table.locator("tbody tr")).not.toHaveCount(0);
  // Each row: a share and the range it likely lies in (at the organisation's 95%), holding it.
  await expect(
    table.getByRole("columnheader", { name: "Likely between (95% interval)" }),
  ).toBeVisible();
  const rows = await table.locator("tbody tr").all();
  expect(rows.length).toBeGreaterThan(2);
  for (const row of rows) {
    const cells = await row.locator("td").allTextContents();
    const rate = parseFloat(cells[2] ?? "");
    const [lower, upper] = (cells[3] ?? "").split(" to ").map((s) => parseFloat(s));
    expect(lower).toBeLessThanOrEqual(rate);
    expect(upper).toBeGreaterThanOrEqual(rate);
  }
  await expect(page.getByTestId("comeback-list").locator("tbody tr")).not.toHaveCount(0);
  // The overall share in words, its method one click away.
  await expect(
    page.getByText(/^[\d,]+ of [\d,]+ repairs \([\d.]+%\), likely between/),
  ).toBeVisible();
  const method = page.getByText(/Wilson 1927/).first();
  await expect(method).toBeHidden();
  await page.locator("[data-figure-details] summary").first().click();
  await expect(method).toBeVisible();
  await screenshot(page, "comebacks-technician");

  await page.getByRole("link", { name: "Technician × job type" }).click();
  await expect(page.getByTestId("comeback-rates-coaching")).toBeVisible();
  await screenshot(page, "comebacks-coaching");

  const download = page.waitForEvent("download");
  await page.getByRole("link", { name: "Download comebacks (CSV)" }).click();
  const file = await download;
  expect(file.suggestedFilename()).toMatch(/^recurra-comebacks-.*\.csv$/);
  const text = await (await file.createReadStream()).toArray();
  const csv = Buffer.concat(text as Buffer[]).toString("utf8");
  expect(csv).toContain("first_ro,first_date");
  expect(csv.split("\r\n").length).toBeGreaterThan(10);
});

test("technicians and viewers get 403 on comebacks and on its export", async ({ page }) => {
  await signIn(page, "technician");
  const res = await page.goto("/comebacks");
  expect(res?.status()).toBe(403);
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(
    "Your role cannot open this page",
  );
  await screenshot(page, "comebacks-forbidden-technician");
  const api = await page.request.get("/api/comebacks?format=csv");
  expect(api.status()).toBe(403);
});

test("a viewer gets 403 on comebacks", async ({ page }) => {
  await signIn(page, "viewer");
  const res = await page.goto("/comebacks");
  expect(res?.status()).toBe(403);
});
