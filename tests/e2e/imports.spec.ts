import type { Page } from "@playwright/test";
import { asRole, expect, orgId, queryDb, screenshot, signIn, test } from "./support";

const FIXTURE = "tests/fixtures/repairs-small.csv";

async function linesOfRo(prefix: string): Promise<number> {
  const [row] = await queryDb<{ n: number }>(
    `select count(*) as n from repair_lines l join repair_orders o on o.id = l.repair_order_id
      where o.organisation_id = ? and o.ro_number like ?`,
    [await orgId("tidewater"), `${prefix}%`],
  );
  return Number(row?.n);
}

test("a manager uploads repairs, maps columns, watches progress, reads the rejects and undoes it", async ({
  page,
}) => {
  await signIn(page, "manager");
  await page.goto("/imports");
  await page.getByLabel("What the file holds").selectOption("repairs");
  await page.getByTestId("file-input").setInputFiles(FIXTURE);
  await page.getByRole("button", { name: "Upload and map columns" }).click();

  // Mapping step: headers matched automatically, first rows shown as they will be read.
  await expect(page.getByRole("heading", { name: "Columns" })).toBeVisible();
  await expect(page.getByLabel("RO number *")).toHaveValue("RO #");
  await expect(page.getByLabel(/^Odometer/).first()).toHaveValue("Mileage");
  const preview = page.getByRole("region", { name: "First rows, as they will be read" });
  await expect(preview.getByText("Will be rejected").first()).toBeVisible();
  await screenshot(page, "import-mapping");
  await page.getByRole("button", { name: "Start import" }).click();

  // Progress, then the result with counts and the rejects report.
  await expect(page.getByRole("status").filter({ hasText: "Imported" })).toBeVisible({
    timeout: 30_000,
  });
  await expect(page.getByTestId("count-rows")).toHaveText("6");
  await expect(page.getByTestId("count-imported")).toHaveText("4");
  await expect(page.getByTestId("count-rejected")).toHaveText("2");
  await expect(page.getByTestId("count-warnings")).toHaveText("1");
  const report = page.getByRole("region", { name: "Rejects report" });
  await expect(report.getByRole("cell", { name: /unknown vehicle NO-SUCH-UNIT/ })).toBeVisible();
  await expect(report.getByRole("cell", { name: /2026-02-31 is not a date/ })).toBeVisible();
  await expect(report.getByRole("cell", { name: /X0300 is not a DTC/ })).toBeVisible();
  await screenshot(page, "import-result");
  expect(await linesOfRo("E2E-")).toBe(4);

  // The rejects download is CSV, safe for spreadsheets.
  const csv = await page.request.get(
    (await report
      .getByRole("link", { name: "Download rejected rows (CSV)" })
      .getAttribute("href")) ?? "",
  );
  expect(csv.headers()["content-type"]).toContain("text/csv");
  const body = await csv.text();
  expect(body.split("\r\n")[0]).toBe("row,severity,column,reason,original row");
  expect(body).toContain("unknown vehicle NO-SUCH-UNIT");

  // The same file again is recognised.
  await page.goto("/imports");
  await page.getByTestId("file-input").setInputFiles(FIXTURE);
  await page.getByRole("button", { name: "Upload and map columns" }).click();
  await expect(page.getByRole("alert").filter({ hasText: /already imported on/ })).toBeVisible();
  await page.getByRole("link", { name: "Open that import" }).click();

  // Undo: the rows are gone.
  await page.getByRole("button", { name: "Undo this import" }).click();
  await page.getByRole("button", { name: "Yes, undo the import" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Undone" })).toBeVisible();
  expect(await linesOfRo("E2E-")).toBe(0);
  await page.goto("/imports");
  await expect(page.getByRole("table", { name: "Import history" })).toContainText("Undone");
  await screenshot(page, "import-history");
});

test("technicians and viewers cannot import", async ({ browser, baseURL }) => {
  for (const role of ["technician", "viewer"] as const) {
    await asRole(browser, baseURL, role, async (page) => {
      const res = await page.goto("/imports");
      expect(res?.status(), role).toBe(403);
      const put = await page.request.put("/api/imports?kind=repairs&name=x.csv", {
        data: "ro_number,unit_number,opened_on\nX,TP-0101,2026-01-01\n",
        headers: { "content-type": "text/csv" },
      });
      expect(put.status(), role).toBe(403);
    });
  }
});

/** Uploads CSV text as repairs and waits for the mapping step. */
async function uploadRepairs(page: Page, name: string, lines: string[]) {
  await page.goto("/imports");
  await page.getByLabel("What the file holds").selectOption("repairs");
  await page.getByTestId("file-input").setInputFiles({
    name,
    mimeType: "text/csv",
    buffer: Buffer.from(lines.join("\r\n")),
  });
  await page.getByRole("button", { name: "Upload and map columns" }).click();
  await expect(page.getByRole("heading", { name: "Columns" })).toBeVisible();
}

test("dates that fit both orders: Start waits for the order, shown with three samples read both ways", async ({
  page,
}) => {
  await signIn(page, "manager");
  await uploadRepairs(page, "dates-either-way.csv", [
    "RO #,Unit,Date In,Mileage,Complaint",
    "E2E-D1,TP-0101,03/04/2026,249800,Noise",
    "E2E-D2,TP-0101,05/06/2026,250100,Squeal",
    "E2E-D3,TP-0102,07/08/2026,249600,Rattle",
  ]);
  const start = page.getByRole("button", { name: "Start import" });
  const question = page.getByRole("group", { name: "Which way round are the dates?" });
  await expect(question).toBeVisible();
  await expect(
    question.getByRole("list", { name: "Sample dates from the file" }).getByRole("listitem"),
  ).toHaveText([
    "Date In: 03/04/2026 → 3 April 2026 or 4 March 2026",
    "Date In: 05/06/2026 → 5 June 2026 or 6 May 2026",
    "Date In: 07/08/2026 → 7 August 2026 or 8 July 2026",
  ]);
  await expect(start).toBeDisabled();
  await screenshot(page, "import-date-order-question");
  // Chosen: Start is enabled and the preview reads the dates day first.
  await question.getByRole("radio", { name: /Day first/ }).check();
  await expect(start).toBeEnabled();
  const preview = page.getByRole("region", { name: "First rows, as they will be read" });
  await expect(preview.getByRole("cell", { name: "2026-04-03" })).toBeVisible();
});

test("a date with a day above 12 decides, and a notice above the preview says which date", async ({
  page,
}) => {
  await signIn(page, "manager");
  await uploadRepairs(page, "dates-day-first.csv", [
    "RO #,Unit,Date In,Mileage,Complaint",
    "E2E-N1,TP-0101,03/04/2026,249800,Noise",
    "E2E-N2,TP-0101,13/04/2026,249900,Squeal",
  ]);
  const notice = page.getByRole("note", { name: "How dates are read" });
  await expect(notice).toContainText("Dates are read day/month/year.");
  await expect(notice).toContainText("“Date In” has 13/04/2026, which can only be 13 April 2026.");
  await expect(page.getByRole("group", { name: "Which way round are the dates?" })).toHaveCount(0);
  await expect(page.getByRole("button", { name: "Start import" })).toBeEnabled();
});
