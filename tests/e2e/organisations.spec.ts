import { expect, orgId, queryDb, screenshot, signIn, test } from "./support";

async function firstVehicleOf(slug: string): Promise<number> {
  const [row] = await queryDb<{ id: number }>(
    "select id from vehicles where organisation_id = ? order by id limit 1",
    [await orgId(slug)],
  );
  return Number(row?.id);
}

async function countOf(table: string, slug: string): Promise<number> {
  const [row] = await queryDb<{ n: number }>(
    `select count(*) as n from ${table} where organisation_id = ?`,
    [await orgId(slug)],
  );
  return Number(row?.n);
}

test("a request for another organisation's record is refused", async ({ page }) => {
  // The manager belongs to Tidewater only; this vehicle belongs to Northgate.
  const foreign = await firstVehicleOf("northgate");
  const own = await firstVehicleOf("tidewater");
  await signIn(page, "manager");
  const mine = await page.request.get(`/api/vehicles/${own}`);
  expect(mine.status()).toBe(200);
  const res = await page.request.get(`/api/vehicles/${foreign}`);
  expect(res.status()).toBe(404);
  expect(await res.json()).toEqual({ error: "No such vehicle in this organisation." });
  const pageRes = await page.goto(`/vehicles/${foreign}`);
  expect(pageRes?.status()).toBe(404);
  await expect(page.getByRole("heading", { name: "Vehicle not found" })).toBeVisible();
  // A search across the list never shows another organisation's vehicles either.
  const list = await page.request.get("/api/vehicles?pageSize=200");
  const { total } = (await list.json()) as { total: number };
  expect(total).toBe(await countOf("vehicles", "tidewater"));
});

test("home shows the active organisation's real figures, and the admin can switch", async ({
  page,
}) => {
  await signIn(page, "admin");
  const check = async (slug: string) => {
    await expect(page.getByTestId("figure-vehicles")).toHaveText(
      (await countOf("vehicles", slug)).toLocaleString("en-GB"),
    );
    await expect(page.getByTestId("figure-repairOrders")).toHaveText(
      (await countOf("repair_orders", slug)).toLocaleString("en-GB"),
    );
    await expect(page.getByTestId("figure-faultEvents")).toHaveText(
      (await countOf("fault_events", slug)).toLocaleString("en-GB"),
    );
    await expect(page.getByTestId("figure-fillUps")).toHaveText(
      (await countOf("fuel_transactions", slug)).toLocaleString("en-GB"),
    );
  };
  await check("tidewater");
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Tidewater Parcel Co-op");
  await page.getByLabel("Organisation").selectOption({ label: "Northgate Auto Clinic (Admin)" });
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Northgate Auto Clinic");
  await check("northgate");
  await screenshot(page, "home-admin-northgate");
  // The switch is kept in the session: a reload stays in Northgate.
  await page.reload();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Northgate Auto Clinic");
});

test("a vehicle page shows the vehicle and its records", async ({ page }) => {
  const id = await firstVehicleOf("tidewater");
  const [v] = await queryDb<{
    unit_number: string;
    make: string;
    model: string;
    model_year: number;
  }>("select unit_number, make, model, model_year from vehicles where id = ?", [id]);
  await signIn(page, "manager");
  await page.goto(`/vehicles/${id}`);
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(
    `${v?.model_year} ${v?.make} ${v?.model}`,
  );
  await expect(page.getByText(`Unit ${v?.unit_number}`)).toBeVisible();
  await screenshot(page, "vehicle");
});

test("health reports the database and migrations", async ({ request }) => {
  const res = await request.get("/api/health");
  expect(res.status()).toBe(200);
  const body = await res.json();
  expect(body).toMatchObject({ ok: true, database: "reachable", migrations: { isCurrent: true } });
  expect(body.migrations.applied).toBe(body.migrations.expected);
});
