import AxeBuilder from "@axe-core/playwright";
import type { Page } from "@playwright/test";
import {
  expect,
  heatmapOf,
  hoverCell,
  openTopRankedCell,
  screenshot,
  signIn,
  test,
} from "./support";

/** Serious and critical accessibility problems found by axe-core on the current page. */
async function seriousViolations(page: Page) {
  const result = await new AxeBuilder({ page }).analyze();
  return result.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`);
}

/** Opens the drill-down of the top-ranked cell of one fault. */
async function openTopDrillDown(page: Page, fault: string) {
  await page.goto(`/patterns?fault=${fault}`);
  await openTopRankedCell(page);
}

test("a period and a vendor narrow the explorer to those repairs, kept in the address", async ({
  page,
}) => {
  // Each new period or vendor is a view computed on first use: on a libSQL server, several
  // of them plus the drill-down's take more than the default minute on a slow machine.
  test.setTimeout(180_000);
  await signIn(page, "manager");
  // A vendor the demo has: the drill-down's list of the cell's vendors offers one.
  await openTopDrillDown(page, "P0730");
  const narrow = page.getByRole("form", { name: "Narrow the repair orders" });
  const vendor =
    (await narrow.getByLabel("Vendor").locator("option").nth(1).getAttribute("value")) ?? "";
  expect(vendor).not.toBe("");

  await page.goto("/patterns");
  const ranked = page.getByRole("table", { name: /Recurring failures ranked/ });
  await page.getByLabel("Repairs from").fill("2023-01-01");
  await expect(page).toHaveURL(/from=2023-01-01/);
  await page.getByLabel("Repairs to").fill("2025-12-31");
  await expect(page).toHaveURL(/to=2025-12-31/);
  await expect(ranked.getByRole("row").nth(1)).toBeVisible();
  const vendorBox = page.getByLabel("Vendor (shop that did the repair)");
  await vendorBox.fill(vendor);
  await vendorBox.press("Enter");
  await expect(page).toHaveURL(/vendor=/);
  await expect(ranked.getByRole("row").nth(1)).toBeVisible();
  await expect(heatmapOf(page)).toBeVisible();
  await screenshot(page, "patterns-period-vendor");

  // The view opens again from its address, with the same filters filled in.
  await page.reload();
  await expect(page.getByLabel("Repairs from")).toHaveValue("2023-01-01");
  await expect(page.getByLabel("Repairs to")).toHaveValue("2025-12-31");
  await expect(vendorBox).toHaveValue(vendor);
  // The API answers the same view, and refuses a period that ends before it starts.
  const api = await page.request.get(
    `/api/cells?from=2023-01-01&to=2025-12-31&vendor=${encodeURIComponent(vendor)}`,
  );
  expect((await api.json()).total).toBeGreaterThan(0);
  expect((await page.request.get("/api/cells?from=2025-01-01&to=2024-01-01")).status()).toBe(400);

  // The drill-down keeps the view: the same repairs behind the figures the ranking showed.
  const top = ranked.getByRole("row").nth(1);
  const events = Number(
    /^(\d+) in /.exec((await top.getByRole("cell").nth(3).textContent()) ?? "")?.[1],
  );
  expect(events).toBeGreaterThan(0);
  await top.getByRole("link").click();
  await expect(page).toHaveURL(/\/patterns\/cell\?.*from=2023-01-01.*to=2025-12-31.*vendor=/);
  await expect(page.getByTestId("cell-view")).toHaveText(
    `For repairs opened 2023-01-01 to 2025-12-31 by ${vendor} only, with the miles driven in that period.`,
  );
  await expect(page.getByTestId("cell-lines-count")).toContainText(
    `${events} repair line${events === 1 ? "" : "s"} opened 2023-01-01 to 2025-12-31 by ${vendor}`,
  );
  await page.getByRole("link", { name: "← This cohort's faults" }).click();
  await expect(page).toHaveURL(/view=faults.*from=2023-01-01/);
  await expect(page.getByLabel("Repairs from")).toHaveValue("2023-01-01");
});

test("a manager explores patterns: ranking, heatmap, filters in the URL, drill-down, export", async ({
  page,
  browser,
  baseURL,
}) => {
  await signIn(page, "manager");
  await page.goto("/patterns");
  // A planted pattern (Merlin M2 shift faults past 75,000 mi, or Kestrel K3 no-starts) tops the list.
  const ranked = page.getByRole("table", { name: /Recurring failures ranked/ });
  const first = ranked.getByRole("row").nth(1);
  await expect(first).toContainText(/Aurel (Merlin M2|Kestrel K3)/);
  await expect(first.getByText("signal", { exact: true })).toBeVisible();
  await screenshot(page, "patterns-explorer");

  // The same pattern as a strong, certain cell: the top colour of the ratio scale.
  await page.goto("/patterns?fault=P0730&metric=ratio");
  await expect(heatmapOf(page)).toBeVisible();
  await hoverCell(page, "Aurel Merlin M2", "150k–175k");
  const tooltip = page.getByRole("tooltip");
  await expect(tooltip).toContainText("Aurel Merlin M2");
  // In words first, then the interval named by its level, and the method; never ∞.
  await expect(tooltip.getByTestId("tooltip-sentence")).toContainText("the rest of the fleet");
  await expect(tooltip.getByTestId("tooltip-interval")).toHaveText(
    /^\d[\d.,]* to (no upper limit|\d[\d.,]*)$/,
  );
  await expect(tooltip).toContainText(/\d+% interval/);
  await expect(tooltip).toContainText("Exact conditional test against the rest of the fleet");
  await expect(tooltip).toContainText("Signal");
  await expect(tooltip).not.toContainText("∞");
  await screenshot(page, "patterns-heatmap-tooltip");

  // A sparse cell shows as uncertain ("too little data"), never as a zero.
  await page.getByText("Show the heatmap as a table").click();
  await expect(page.getByRole("button", { name: /too little data/ }).first()).toBeVisible();

  // Filter to one make; the address keeps the view, and another browser opens the same view.
  await page.getByLabel("Make").selectOption("Brindle");
  await expect(page).toHaveURL(/make=Brindle/);
  await expect(ranked.getByRole("row").nth(1)).toContainText("Brindle");
  const shared = page.url();
  const other = await browser.newContext({ baseURL });
  const second = await other.newPage();
  await signIn(second, "manager");
  await second.goto(shared);
  await expect(second.getByLabel("Make")).toHaveValue("Brindle");
  await expect(
    second
      .getByRole("table", { name: /Recurring failures ranked/ })
      .getByRole("row")
      .nth(1),
  ).toHaveText((await ranked.getByRole("row").nth(1).textContent()) ?? "");
  await other.close();

  // Export: CSV of the filtered ranking, safe for spreadsheets.
  const csvHref = await page.getByRole("link", { name: "Download CSV" }).getAttribute("href");
  const csv = await page.request.get(csvHref ?? "");
  expect(csv.headers()["content-type"]).toContain("text/csv");
  const lines = (await csv.text())
    .replace(/^\uFEFF/, "")
    .trim()
    .split("\r\n");
  // The first export's columns, unchanged, then the figures as the screens show them.
  expect(lines[0]).toBe(
    "make,model,generation,yearFrom,yearTo,bandFrom,bandTo,dtc,component,events,exposureMiles,vehicles,vehiclesAffected,rate,rateLower,rateUpper,ratio,ratioLower,ratioUpper,pValue,qValue,shrunkRate,signal," +
      "kind,faultName,shareAffected,shareLower,shareUpper,shrunkRateLower,shrunkRateUpper,distanceUnit,confidence,rateInWords,ratioInWords,shareInWords,steadyRateInWords",
  );
  expect(lines.length).toBeGreaterThan(1);
  expect(lines.slice(1).every((l) => l.startsWith("Brindle,"))).toBe(true);

  // Drill down from the ranked list.
  await openTopDrillDown(page, "P0730");
  await expect(page).toHaveURL(/\/patterns\/cell\?/);
  await expect(page.getByTestId("cell-sentence")).toHaveText(
    /^\d+ repairs in [\d,]+ mi driven: about [\d.,]+ per 10,000 mi, likely between [\d.,]+ and [\d.,]+; .*the rest of the fleet/,
  );
  await expect(page.getByTestId("cell-sentence")).not.toContainText("∞");
  await expect(
    page
      .getByRole("region", { name: /Recurrence over mileage/ })
      .locator("svg")
      .first(),
  ).toBeVisible();
  await expect(page.getByRole("link", { name: "Start a known issue from this" })).toHaveAttribute(
    "href",
    /^\/known-issues\/new\?make=Aurel&model=Merlin/,
  );
  const ordersCsv = await page.request.get(
    (await page.getByRole("link", { name: "Download CSV" }).getAttribute("href")) ?? "",
  );
  expect((await ordersCsv.text()).split("\r\n")[0]).toContain("ro_number,unit_number,vin");
  await screenshot(page, "patterns-drill-down");

  // Narrow the repair orders to one vendor; empty dates are no filter; the CSV follows.
  const narrow = page.getByRole("form", { name: "Narrow the repair orders" });
  const vendor = await narrow.getByLabel("Vendor").locator("option").nth(1).getAttribute("value");
  await narrow.getByLabel("Vendor").selectOption(vendor ?? "");
  await narrow.getByRole("button", { name: "Apply" }).click();
  await expect(page).toHaveURL(/vendor=/);
  // The figures above become that vendor's: the same number of repairs as lines listed.
  await expect(page.getByTestId("cell-view")).toHaveText(
    `For repairs by ${vendor} only, against all the miles driven.`,
  );
  const count = (await page.getByTestId("cell-lines-count").textContent()) ?? "";
  expect(count).toMatch(new RegExp(`^\\d+ repair lines? by ${vendor}; `));
  const repairs = page
    .locator("dt", { hasText: /^Repairs$/ })
    .locator("xpath=following-sibling::dd[1]");
  await expect(repairs).toHaveText(/^\d+$/.exec(count.split(" ")[0] ?? "")?.[0] ?? "none");
  const narrowedCsv = await page.request.get(
    (await page.getByRole("link", { name: "Download CSV" }).getAttribute("href")) ?? "",
  );
  const rows = (await narrowedCsv.text()).trim().split("\r\n").slice(1);
  expect(rows.length).toBeGreaterThan(0);
  expect(rows.every((r) => r.includes(vendor ?? "?"))).toBe(true);
});

test("an unknown cell is a 404, and a bad filter is answered with 400", async ({ page }) => {
  await signIn(page, "viewer");
  const res = await page.goto("/patterns/cell?make=Nope&model=X&generation=Y&band=1&fault=P0300");
  expect(res?.status()).toBe(404);
  const api = await page.request.get("/api/cells?limit=abc");
  expect(api.status()).toBe(400);
});

test("the explorer and the drill-down have no serious accessibility problems (axe-core)", async ({
  page,
}) => {
  await signIn(page, "manager");
  await page.goto("/patterns?fault=P0730");
  await expect(heatmapOf(page)).toBeVisible();
  expect(await seriousViolations(page)).toEqual([]);
  await openTopRankedCell(page);
  await expect(page.getByTestId("cell-sentence")).toBeVisible();
  expect(await seriousViolations(page)).toEqual([]);
});

test("the wear switch shows wear cells, marked Wear and worded as wearing out sooner", async ({
  page,
}) => {
  await signIn(page, "manager");
  await page.goto("/patterns");
  // Failures are the default view.
  await expect(page.getByRole("heading", { name: "Recurring failures, ranked" })).toBeVisible();
  await expect(page.getByRole("radio", { name: /^Failures/ })).toBeChecked();
  // A controlled choice: it shows as chosen once the address has changed.
  await page.getByRole("radio", { name: /^Wear/ }).click();
  await expect(page.getByRole("radio", { name: /^Wear/ })).toBeChecked();
  await expect(page).toHaveURL(/kind=wear/);
  await expect(page.getByRole("heading", { name: "Early wear, ranked" })).toBeVisible();
  await expect(
    page.getByRole("heading", { level: 2, name: /^Wear: cohorts × mileage bands, all wear/ }),
  ).toBeVisible();
  const ranked = page.getByRole("table", { name: /Early wear ranked/ });
  const first = ranked.getByRole("row").nth(1);
  await expect(first.getByTestId("wear-badge")).toHaveText("Wear");
  await expect(
    ranked.getByRole("columnheader", { name: /^Wear repairs per 10,000 mi/ }),
  ).toBeVisible();
  await screenshot(page, "patterns-wear");
  // The API answers wear cells only when asked, and failures otherwise.
  const wear = (await (await page.request.get("/api/cells?kind=wear&limit=50")).json()) as {
    cells: { kind: string }[];
  };
  expect(wear.cells.length).toBeGreaterThan(0);
  expect(wear.cells.every((c) => c.kind === "wear")).toBe(true);
  const failures = (await (await page.request.get("/api/cells?limit=50")).json()) as {
    cells: { kind: string }[];
  };
  expect(failures.cells.every((c) => c.kind === "failure")).toBe(true);
  // Its drill-down says it is wear, and compares how soon it wears out.
  await first.getByRole("link").click();
  await expect(page).toHaveURL(/\/patterns\/cell\?/);
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(/^Wear: /);
  await expect(page.getByTestId("wear-badge").first()).toBeVisible();
  await expect(page.getByTestId("cell-sentence")).toContainText(/wear repairs? in .*wear out/);
  // Back to the cohort's wear, still in the wear view.
  await page.getByRole("link", { name: "← This cohort's wear" }).click();
  await expect(page).toHaveURL(/kind=wear/);
});
