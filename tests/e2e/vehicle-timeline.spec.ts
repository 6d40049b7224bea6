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
  const link = patterns.getByRole("link", { name: /^Open the pattern P0496, 150,000/ });
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
  await expect(
    patterns.getByText(
      /Aurel Kestrel K2, 150,000–175,000 mi, P0496 \(purge flow.*inside the band\./,
    ),
  ).toBeVisible();

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
