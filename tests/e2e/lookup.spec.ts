import { mkdirSync, writeFileSync } from "node:fs";
import { expect, orgId, queryDb, screenshot, signIn, test } from "./support";

/** Page objects in a PDF: `/Type /Page` (not `/Type /Pages`, the page tree). */
function countPdfPages(pdf: Buffer): number {
  return pdf.toString("latin1").match(/\/Type\s*\/Page(?![s\w])/g)?.length ?? 0;
}

/**
 * A Northgate Aurel Kestrel K2 of the demo with a VIN and an odometer reading: the one with the
 * highest or lowest id, so that two tests recording findings use different vehicles.
 */
async function northgateKestrelK2(order: "asc" | "desc") {
  const north = await orgId("northgate");
  const [v] = await queryDb<{ id: number; vin: string; last_odometer_mi: number }>(
    `select v.id, v.vin, v.last_odometer_mi from vehicles v join generations g on g.id = v.generation_id
      where v.organisation_id = ? and v.make = 'Aurel' and v.model = 'Kestrel' and g.label = 'K2'
        and v.vin is not null and v.last_odometer_mi is not null
      order by v.id ${order} limit 1`,
    [north],
  );
  expect(v).toBeDefined();
  return v!;
}

test("technician: a Kestrel K2 with P0496 gets the purge valve first, prints one page, records the cause", async ({
  page,
}) => {
  // The planted purge-valve pattern's cohort; the highest id (the next test takes the lowest).
  const v = await northgateKestrelK2("desc");
  const odometer = String(Math.round(Number(v.last_odometer_mi)));

  await signIn(page, "technician");
  await page.goto("/lookup");
  await page.getByLabel("VIN").fill(v.vin);
  await page.getByLabel("Odometer (mi)").fill(odometer);
  await page.getByLabel("Codes (DTCs)").fill("P0496");
  await page.getByRole("button", { name: "Look up" }).click();
  await page.waitForURL(/\/lookup\?.*vin=/);

  // The VIN is decoded (49 CFR 565) and the code's structure shown (SAE J2012).
  await expect(page.getByTestId("vin-check")).toContainText("check digit correct");
  await expect(page.getByTestId("codes")).toContainText("powertrain, generic (SAE/ISO)");
  await expect(page.getByTestId("vehicle-found")).toContainText("Aurel Kestrel K2");

  const first = page.getByTestId("cause").first();
  await expect(first.getByRole("heading", { level: 3 })).toContainText(
    "Stalls just after refuelling: purge valve sticking open",
  );
  // In words first: count of its denominator, the share, and its likely range.
  await expect(first.getByTestId("cause-share")).toContainText(
    /Was the cause in \d+ of \d+ cases \(\d+(\.\d)?%\), likely between \d/,
  );
  await expect(first.getByTestId("checks").getByRole("listitem")).toHaveCount(5);
  await expect(first.getByTestId("checks").getByRole("listitem").first()).toContainText(
    "within a few miles of a fill-up",
  );
  await expect(first.getByTestId("cautions")).toContainText("Fuel vapour");
  await expect(first.getByTestId("fix-success")).toContainText(
    /The fix held in \d+ of \d+ repairs \(\d+(\.\d)?%\), likely between .*; \d+ came back within \d+ days or [\d,]+ mi/,
  );
  // The codes by their names, never ∞ or an exponent in the figures.
  await expect(page.getByTestId("codes")).toContainText("P0496 — ");
  await expect(page.getByTestId("causes")).not.toContainText(/∞|\de-\d/);
  await expect(page.getByRole("note")).toContainText(
    "Manufacturer procedures, local codes and licensed practice come first",
  );
  // Every result block carries its cautions.
  const blocks = await page.getByTestId("cause").count();
  await expect(page.getByTestId("cautions")).toHaveCount(blocks);
  await expect(page.getByRole("button", { name: "Print sheet" })).toBeVisible();
  await screenshot(page, "lookup-desktop");

  // The printable sheet: one page on A4 and on Letter.
  mkdirSync("test-results/screens", { recursive: true });
  await page.emulateMedia({ media: "print" });
  for (const format of ["A4", "Letter"] as const) {
    const pdf = await page.pdf({ format, printBackground: true });
    writeFileSync(`test-results/screens/lookup-sheet-${format.toLowerCase()}.pdf`, pdf);
    expect(countPdfPages(pdf), `${format} sheet pages`).toBe(1);
  }
  // A picture of the sheet as printed (A4 less 10 mm margins is about 718 px wide at 96 dpi).
  const desktop = page.viewportSize()!;
  await page.setViewportSize({ width: 718, height: 1000 });
  await screenshot(page, "lookup-print");
  await page.setViewportSize(desktop);
  await page.emulateMedia({ media: "screen" });

  // Tablet at the bay: about 800 px wide, nothing wider than the screen.
  await page.setViewportSize({ width: 800, height: 1180 });
  await screenshot(page, "lookup-tablet");
  const overflow = await page.evaluate(
    () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
  );
  expect(overflow).toBeLessThanOrEqual(0);

  // Record the finding: this was the cause.
  await first.getByRole("button", { name: "This was the cause" }).click();
  const status = first.getByRole("status");
  await expect(status).toContainText("Recorded: this was the cause");
  await expect(status).toContainText(/Repair order F-\d+/);
  await screenshot(page, "lookup-recorded");
  const [finding] = await queryDb<{ outcome: string; ro_number: string }>(
    `select f.outcome, o.ro_number from known_issue_findings f
       join repair_lines l on l.id = f.repair_line_id join repair_orders o on o.id = l.repair_order_id
      where f.vehicle_id = ? order by f.id desc limit 1`,
    [v.id],
  );
  expect(finding?.outcome).toBe("confirmed");
  await expect(status).toContainText(String(finding?.ro_number));
});

test("technician: a computed pattern's 'This was the cause' records the line fixed at its component", async ({
  page,
}) => {
  // Another Kestrel K2 than the first test's (which records on the highest id).
  const v = await northgateKestrelK2("asc");
  await signIn(page, "technician");
  await page.goto(
    `/lookup?vin=${v.vin}&odometer=${Math.round(Number(v.last_odometer_mi))}&dtc=P0496`,
  );
  const pattern = page
    .getByTestId("cause")
    .filter({ has: page.getByRole("heading", { level: 3, name: /^\d+\.\s*Pattern: / }) })
    .first();
  const heading = (await pattern.getByRole("heading", { level: 3 }).innerText()).trim();
  const title = heading.replace(/^\d+\.\s*Pattern:\s*/, "");
  await pattern.getByRole("button", { name: "This was the cause" }).click();
  await expect(pattern.getByRole("status")).toContainText(
    `Recorded: this was the cause (${title})`,
  );
  const [finding] = await queryDb<{
    known_issue_id: number | null;
    component: string;
    cause: string;
  }>(
    `select f.known_issue_id, k.system || ' → ' || k.name as component, l.cause
       from known_issue_findings f join repair_lines l on l.id = f.repair_line_id
       join components k on k.id = l.component_id
      where f.vehicle_id = ? order by f.id desc limit 1`,
    [v.id],
  );
  expect(finding).toEqual({ known_issue_id: null, component: title, cause: title });
});

test("a VIN that is not in the organisation is decoded and said plainly; a bad code is named", async ({
  page,
}) => {
  await signIn(page, "technician");
  // 49 CFR 565 worked example with its check digit changed (trade-facts.md): a warning only.
  await page.goto("/lookup?vin=1M8GDM9A1KP042788&dtc=P0496+X12");
  await expect(page.getByRole("alert").first()).toContainText(
    "No vehicle with VIN 1M8GDM9A1KP042788",
  );
  // A technician may not add vehicles: the page says who can, rather than offering it.
  await expect(page.getByRole("alert").first()).toContainText("ask a manager to add the vehicle");
  await expect(page.getByTestId("vin-check")).toContainText("warning: check digit does not match");
  await expect(page.getByTestId("vin-check")).toContainText("model year 1989"); // position 7 is a digit: 1980–2009 cycle (49 CFR 565, 73 FR 23367);
  await expect(page.locator("#dtc-error")).toContainText("Not a diagnostic trouble code");
  await expect(page.getByLabel("Codes (DTCs)")).toHaveValue("P0496 X12");
});

test("a walk-in not on file is looked up by make, model and year; no finding forms, a way to add it", async ({
  page,
}) => {
  const north = await orgId("northgate");
  // A model year of the Kestrel K2 in Northgate's generation catalogue.
  const [g] = await queryDb<{ year_from: number }>(
    `select year_from from generations where organisation_id = ? and make = 'Aurel'
        and model = 'Kestrel' and label = 'K2'`,
    [north],
  );
  expect(g).toBeDefined();
  await signIn(page, "technician");
  await page.goto("/lookup");
  await page.getByLabel("Make", { exact: true }).fill("aurel");
  await page.getByLabel("Model", { exact: true }).fill("kestrel");
  await page.getByLabel("Model year", { exact: true }).fill(String(g!.year_from));
  await page.getByLabel("Odometer (mi)").fill("61,250");
  await page.getByLabel("Codes (DTCs)").fill("P0496");
  await page.getByRole("button", { name: "Look up" }).click();
  await page.waitForURL(/\/lookup\?.*make=aurel/);

  await expect(page.getByTestId("vehicle-found")).toContainText("Aurel Kestrel K2");
  await expect(page.getByTestId("vehicle-found")).toContainText("not on file");
  await expect(page.getByTestId("walk-in")).toContainText("ask a manager to add the vehicle");
  const first = page.getByTestId("cause").first();
  await expect(first.getByRole("heading", { level: 3 })).toContainText(
    "Stalls just after refuelling: purge valve sticking open",
  );
  await expect(first.getByTestId("cautions")).toContainText("Fuel vapour");
  // Findings belong to a vehicle's record: none can be recorded on a vehicle not on file.
  await expect(page.getByRole("button", { name: "This was the cause" })).toHaveCount(0);
  await expect(page.getByText("Something else was the cause")).toHaveCount(0);
  await expect(page.getByRole("link", { name: "This vehicle's history →" })).toHaveCount(0);
  await screenshot(page, "lookup-walk-in");

  // A make and model nobody has is said plainly.
  await page.goto("/lookup?make=Zephyrine&model=Quill&year=2020");
  await expect(page.getByRole("alert").first()).toContainText("No Zephyrine Quill in Northgate");
  // Half a cohort asks for the rest.
  await page.goto("/lookup?make=Aurel");
  await expect(page.getByRole("alert").first()).toContainText(
    "enter its make, model and model year",
  );
});

test("a viewer gets 403 on the lookup", async ({ page }) => {
  await signIn(page, "viewer");
  const res = await page.goto("/lookup");
  expect(res?.status()).toBe(403);
});
