import { asRole, expect, screenshot, signIn, test, type DemoRole } from "./support";

/** What each role sees in the main navigation (product brief, "Roles"). */
const NAV: Record<DemoRole, string[]> = {
  admin: [
    "Home",
    "Patterns",
    "Known issues",
    "Lookup",
    "Vehicles",
    "Refuel analysis",
    "At risk",
    "Comebacks",
    "Stocking",
    "Parts",
    "Imports",
    "Settings",
  ],
  manager: [
    "Home",
    "Patterns",
    "Known issues",
    "Lookup",
    "Vehicles",
    "Refuel analysis",
    "At risk",
    "Comebacks",
    "Stocking",
    "Parts",
    "Imports",
  ],
  shopManager: [
    "Home",
    "Patterns",
    "Known issues",
    "Lookup",
    "Vehicles",
    "Refuel analysis",
    "At risk",
    "Comebacks",
    "Stocking",
    "Parts",
    "Imports",
  ],
  technician: ["Home", "Patterns", "Known issues", "Lookup", "Vehicles"],
  viewer: ["Home", "Patterns", "Known issues", "Refuel analysis"],
};

const PATHS: Record<string, string> = {
  Home: "/",
  Patterns: "/patterns",
  "Known issues": "/known-issues",
  Lookup: "/lookup",
  Vehicles: "/vehicles",
  "Refuel analysis": "/refuel",
  "At risk": "/at-risk",
  Comebacks: "/comebacks",
  Stocking: "/stocking",
  Parts: "/parts",
  Imports: "/imports",
  Settings: "/settings",
};

for (const role of Object.keys(NAV) as (keyof typeof NAV)[]) {
  test(`${role}: sees exactly its screens, and gets 403 for the others`, async ({ page }) => {
    await signIn(page, role);
    const nav = page.getByRole("navigation", { name: "Main" });
    await expect(nav.getByRole("link")).toHaveText(NAV[role]);
    await screenshot(page, `home-${role}`);

    for (const label of NAV[role]) {
      const res = await page.goto(PATHS[label] ?? "/");
      expect(res?.status(), `${role} opens ${label}`).toBe(200);
      await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
    }
    for (const label of Object.keys(PATHS).filter((l) => !NAV[role].includes(l))) {
      const res = await page.goto(PATHS[label] ?? "/");
      expect(res?.status(), `${role} is refused ${label}`).toBe(403);
      await expect(page.getByRole("heading", { level: 1 })).toHaveText(
        "Your role cannot open this page",
      );
    }
  });
}

test("technician opening admin settings gets the 403 page", async ({ page }) => {
  await signIn(page, "technician");
  const res = await page.goto("/settings");
  expect(res?.status()).toBe(403);
  await expect(page.getByText("403 · Not allowed")).toBeVisible();
  await screenshot(page, "forbidden-technician-settings");
});

test("viewer and technician posting to a write route are refused with 403", async ({
  browser,
  baseURL,
}) => {
  const body = { unitNumber: "TP-9999", make: "Aurel", model: "Kestrel", modelYear: 2018 };
  for (const role of ["viewer", "technician"] as const) {
    await asRole(browser, baseURL, role, async (page) => {
      const res = await page.request.post("/api/vehicles", { data: body });
      expect(res.status(), role).toBe(403);
      expect((await res.json()).error).toContain(`The ${role} role may not do this`);
    });
  }
});

test("manager adds a vehicle through the API and the form; bad input gets clear errors", async ({
  page,
}) => {
  await signIn(page, "manager");
  const bad = await page.request.post("/api/vehicles", {
    data: { vin: "1M8GDM9AXKP04278O", make: "", model: "Kestrel", modelYear: 1900 },
  });
  expect(bad.status()).toBe(400);
  const issues = (await bad.json()).issues as { path: string[]; message: string }[];
  expect(issues.map((i) => i.path[0]).sort()).toEqual(["make", "modelYear", "vin"]);

  const notJson = await page.request.post("/api/vehicles", {
    data: "not json",
    headers: { "content-type": "application/json" },
  });
  expect(notJson.status()).toBe(400);

  const ok = await page.request.post("/api/vehicles", {
    data: { unitNumber: "TP-API-1", make: "Aurel", model: "Kestrel", modelYear: 2016 },
  });
  expect(ok.status()).toBe(201);
  const again = await page.request.post("/api/vehicles", {
    data: { unitNumber: "TP-API-1", make: "Aurel", model: "Kestrel", modelYear: 2016 },
  });
  expect(again.status()).toBe(409);

  await page.goto("/vehicles");
  const form = page
    .getByRole("region", { name: "Add a vehicle" })
    .or(page.locator("form", { hasText: "Add vehicle" }));
  await form.getByLabel("Unit number").fill("TP-FORM-1");
  await form.getByLabel("Make").fill("Aurel");
  await form.getByLabel("Model", { exact: true }).fill("Merlin");
  await form.getByLabel("Model year").fill("20x9");
  await form.getByRole("button", { name: "Add vehicle" }).click();
  await expect(form.getByRole("alert")).toContainText("correct the fields");
  await expect(form.getByText("Model year must be a year.")).toBeVisible();
  // A rejected form keeps what was typed.
  await expect(form.getByLabel("Make")).toHaveValue("Aurel");
  await expect(form.getByLabel("Unit number")).toHaveValue("TP-FORM-1");
  await form.getByLabel("Model year").fill("2019");
  await form.getByRole("button", { name: "Add vehicle" }).click();
  await expect(form.getByRole("status")).toHaveText("Vehicle added.");
  await expect(form.getByLabel("Unit number")).toHaveValue("");
  await page.goto("/vehicles?q=TP-FORM-1");
  await expect(page.getByRole("cell", { name: "2019 Aurel Merlin" })).toBeVisible();
  await expect(
    page.getByRole("cell", { name: "M2" }).or(page.getByRole("cell", { name: /M\d/ })),
  ).toBeVisible();
});

test("admin changes a setting, and the audit log records who did it", async ({ page }) => {
  await signIn(page, "admin");
  await page.goto("/settings");
  const field = page.getByLabel(/Comeback window \(days\)/);
  await field.fill("45");
  await page.getByRole("button", { name: "Save settings" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Settings saved." })).toBeVisible();
  await page.reload();
  await expect(page.getByLabel(/Comeback window \(days\)/)).toHaveValue("45");
  await page.getByLabel(/Comeback window \(days\)/).fill("0");
  await page.getByRole("button", { name: "Save settings" }).click();
  await expect(page.getByRole("alert").filter({ hasText: "correct the fields" })).toBeVisible();
  await expect(page.getByLabel(/Comeback window \(days\)/)).toHaveValue("0");
  await page.getByLabel(/Comeback window \(days\)/).fill("30");
  await page.getByRole("button", { name: "Save settings" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Settings saved." })).toBeVisible();
  await page.goto("/settings/audit");
  await expect(page.getByRole("row", { name: /settings\.update/ }).first()).toContainText(
    "comebackDays",
  );
  await screenshot(page, "audit-log");
});
