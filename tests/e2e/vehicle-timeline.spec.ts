import { expect, orgId, queryDb, screenshot, signIn, test } from "./support";

type Row = { id: number; unit_number: string; band_index: number };

/**
 * A Tidewater Kestrel K2 with a stall repair (the demo plants its purge-valve stalls there) whose
 * odometer is now inside the band of the K2 purge-flow signal (P0496).
 */
async function k2WithStall(): Promise<Row> {
  const [row] = await queryDb<Row>(
    `select v.id, v.unit_number, c.band_index from vehicles v
       join generations g on g.id = v.generation_id
       join cell_stats c on c.organisation_id = v.organisation_id and c.model = v.model
        and c.cohort_label = g.label and c.fault_key = 'dtc:P0496' and c.is_signal = 1
        and v.last_odometer_mi >= c.band_from_mi and v.last_odometer_mi < c.band_to_mi
      where v.organisation_id = ? and v.model = 'Kestrel' and g.label = 'K2'
        and exists (select 1 from repair_lines l where l.vehicle_id = v.id and l.symptom = 'stall')
      order by v.id limit 1`,
    [await orgId("tidewater")],
  );
  if (!row) throw new Error("no Kestrel K2 with a stall repair inside the P0496 signal band");
  return {
    id: Number(row.id),
    unit_number: String(row.unit_number),
    band_index: Number(row.band_index),
  };
}

test("a vehicle's timeline: chart on two axes, records table and matching patterns", async ({
  page,
}) => {
  const vehicle = await k2WithStall();
  const [latest] = await queryDb<{ ro_number: string; opened_on: string; odometer_mi: number }>(
    `select ro_number, opened_on, odometer_mi from repair_orders
      where vehicle_id = ? order by opened_on desc, id desc limit 1`,
    [vehicle.id],
  );

  await signIn(page, "manager");
  await page.goto(`/vehicles/${vehicle.id}`);
  await expect(page.getByText(`Unit ${vehicle.unit_number}`)).toBeVisible();

  // The chart: an svg inside the Timeline region, on the mileage axis first.
  const timeline = page.getByRole("region", { name: "Timeline" });
  const chart = timeline.locator('svg[role="img"]');
  await expect(chart).toHaveAttribute("aria-label", /by odometer: \d+ Repairs, \d+ Fault codes/);
  await expect(chart).toContainText("Odometer (mi)");
  await expect(timeline.getByText("Pattern band")).toBeVisible();
  // A repair's marker shows its details on hover.
  await chart.locator('path[fill="#D55E00"]').last().hover({ force: true });
  await expect(timeline.getByText(/RO [A-Z0-9-]+/).first()).toBeVisible();

  // Switching the axis redraws the chart by date.
  await timeline.getByRole("radio", { name: "Date" }).check();
  await expect(chart).toHaveAttribute("aria-label", /by date/);
  await expect(chart).toContainText("Date (UTC)");
  await timeline.getByRole("radio", { name: "Mileage (mi)" }).check();
  await expect(chart).toHaveAttribute("aria-label", /by odometer/);

  // The same records in the table: the latest repair order, with its date and odometer.
  const table = page.getByRole("table", { name: "Timeline records" });
  const row = table.getByRole("row").filter({ hasText: `RO ${latest!.ro_number}` });
  await expect(row).toHaveCount(1);
  await expect(row.getByRole("cell").nth(0)).toHaveText("Repair");
  await expect(row.getByRole("cell").nth(1)).toHaveText(latest!.opened_on);
  await expect(row.getByRole("cell").nth(2)).toHaveText(
    `${Math.round(Number(latest!.odometer_mi)).toLocaleString("en-GB")} mi`,
  );

  // The K2 purge-flow signal, in words, with its drill-down link.
  const patterns = page.getByRole("region", { name: "Patterns this vehicle matches" });
  await expect(patterns.getByRole("note")).toContainText("Safety");
  const link = patterns.getByRole("link", { name: /^Open the pattern P0496 — .+, 150,000/ });
  await expect(link).toHaveCount(1);
  const href = new URL((await link.getAttribute("href")) ?? "", "http://x");
  expect(href.pathname).toBe("/patterns/cell");
  expect(Object.fromEntries(href.searchParams)).toEqual({
    make: "Aurel",
    model: "Kestrel",
    generation: "K2",
    band: String(vehicle.band_index),
    fault: "dtc:P0496",
  });
  // In words: the fault by name, the count over the distance driven, the ratio against the rest
  // of the fleet; the p- and q-value one click away.
  await expect(
    patterns.getByText(
      /^Aurel Kestrel K2, 150,000–175,000 mi, P0496 — Purge flow.*: \d+ repairs in [\d,]+ mi driven: about [\d.]+ per 10,000 mi, likely between .*the rest of the fleet.*inside the band\.$/,
    ),
  ).toBeVisible();
  const item = patterns.getByRole("listitem").filter({ hasText: "150,000–175,000 mi, P0496 — " });
  const figures = item.locator("[data-figure-details]");
  await expect(figures.getByText("p (exact test of the ratio)")).toBeHidden();
  await figures.locator("summary").click();
  await expect(figures.getByText("p (exact test of the ratio)")).toBeVisible();
  await expect(figures.getByText("q (false-discovery rate)")).toBeVisible();
  await expect(patterns).not.toContainText(/\de-\d|∞|q = /);

  await screenshot(page, "vehicle-timeline");

  // At tablet width nothing pushes the page sideways.
  await page.setViewportSize({ width: 820, height: 1180 });
  await expect(chart).toBeVisible();
  const overflow = await page.evaluate(
    () => document.documentElement.scrollWidth - window.innerWidth,
  );
  expect(overflow).toBeLessThanOrEqual(0);
  await screenshot(page, "vehicle-timeline-tablet");
});

test("a wear pattern is marked as wear and reads as wearing out sooner", async ({ page }) => {
  // A Northgate vehicle inside, or within one band before, a wear cell above the rest of the fleet.
  const [row] = await queryDb<{ id: number }>(
    `select v.id from vehicles v
       left join generations g on g.id = v.generation_id
       join cell_stats c on c.organisation_id = v.organisation_id and c.make = v.make
        and c.model = v.model and c.cohort_label = coalesce(g.label, cast(v.model_year as text))
        and c.kind = 'wear' and c.ratio_lower > 1 and c.fault_key <> 'all:wear'
      where v.organisation_id = ?
        and v.last_odometer_mi >= c.band_from_mi - (c.band_to_mi - c.band_from_mi)
        and v.last_odometer_mi < c.band_to_mi
      order by v.id limit 1`,
    [await orgId("northgate")],
  );
  expect(row, "the demo has a wear pattern above the rest of the fleet").toBeDefined();
  await signIn(page, "shopManager");
  await page.goto(`/vehicles/${Number(row!.id)}`);
  const patterns = page.getByRole("region", { name: "Patterns this vehicle matches" });
  const wear = patterns.getByRole("listitem").filter({ has: page.getByTestId("wear-label") });
  await expect(wear.first().getByTestId("wear-label")).toHaveText("Wear");
  await expect(wear.first()).toContainText("wears out sooner than on the rest of the fleet");
  await expect(wear.first()).toContainText(/\d+ replacements? in [\d,]+ mi driven/);
  await expect(wear.first()).not.toContainText(/fail/i);
});
