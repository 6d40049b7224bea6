import { asRole, expect, openTopRankedCell, queryDb, screenshot, signIn, test } from "./support";

/** A 1×1 PNG (the smallest valid image), and a text file that only pretends to be one. */
const PNG = Buffer.from(
  "iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==",
  "base64",
);

test("a manager starts a known issue from a signal; it opens watching, with its evidence", async ({
  page,
}) => {
  await signIn(page, "shopManager");
  await page.goto("/patterns?signals=1");
  await openTopRankedCell(page);
  await page.getByRole("link", { name: "Start a known issue from this" }).click();
  await expect(page).toHaveURL(/\/known-issues\/new\?/);
  const form = page.getByRole("form", { name: "Known issue" });
  // Prefilled from the cell: a title, the evidence in words, one cohort ticked, a mileage range.
  await expect(form.getByLabel("Title")).not.toHaveValue("");
  await expect(form.getByLabel("What happens and why")).toHaveValue(/^Started from the cell /);
  await expect(form.locator('input[type="checkbox"][name^="cohort:"]:checked')).toHaveCount(1);
  await expect(form.getByLabel(/Mileage from/)).not.toHaveValue("");
  await screenshot(page, "known-issue-new-from-cell");

  // A bad code is refused with a message on the field; nothing is lost.
  await form.getByLabel("DTCs").fill("P0550 Q123");
  await form.getByRole("button", { name: "Create known issue" }).click();
  await expect(form.getByText(/Not a diagnostic trouble code.*Q123/)).toBeVisible();
  await expect(form.getByLabel("Title")).not.toHaveValue("");

  await form.getByLabel("DTCs").fill("P0550");
  await form
    .getByLabel("Quick checks, in order")
    .fill("Look at the connector\nWiggle-test the loom");
  await form.getByRole("button", { name: "Create known issue" }).click();
  await expect(page).toHaveURL(/\/known-issues\/\d+$/);
  await expect(page.getByTestId("state-badge").first()).toHaveText("Watching");
  await expect(page.getByTestId("quick-checks").getByRole("listitem")).toHaveText([
    "Look at the connector",
    "Wiggle-test the loom",
  ]);
  await expect(page.getByTestId("history")).toContainText("Started as watching");
  await expect(page.getByRole("table", { name: /Computed cells covered/ })).toBeVisible();
  const id = Number(page.url().split("/").at(-1));
  const [signal] = await queryDb<{ state: string }>(
    "select state from signals where known_issue_id = ?",
    [id],
  );
  expect(signal?.state).toBe("promoted");
});

test("the manager confirms a known issue with a reason; watchers are e-mailed; history records it", async ({
  page,
}) => {
  await signIn(page, "manager");
  await page.goto("/known-issues");
  await page
    .getByRole("link", { name: "Intermittent no-start: poor contact at the main fuse" })
    .click();
  await expect(page.getByTestId("cautions")).toContainText("Electrical");
  await expect(page.getByRole("note")).toContainText("Manufacturer procedures");
  await expect(page.getByTestId("fix-success")).toContainText(
    /The fix held in \d+ of \d+ repairs \(\d+(\.\d)?%\), likely between/,
  );
  await screenshot(page, "known-issue-detail");

  const stateForm = page.getByRole("form", { name: "Change state" });
  await stateForm.getByLabel("Move to").selectOption("confirmed");
  await stateForm.getByRole("button", { name: "Change state" }).click();
  await expect(stateForm.getByText(/Say why/)).toBeVisible();
  await stateForm.getByLabel("Why").fill("Five findings in the bay, fix holds.");
  await stateForm.getByRole("button", { name: "Change state" }).click();
  await expect(page.getByRole("status")).toContainText("State changed");
  await expect(page.getByTestId("state-badge").first()).toHaveText("Confirmed");
  await expect(page.getByTestId("history")).toContainText(
    "Watching → Confirmed: Five findings in the bay, fix holds.",
  );
  const mail = await queryDb<{ to_address: string }>(
    "select to_address from email_outbox where subject = ?",
    ["Known issue confirmed: Intermittent no-start: poor contact at the main fuse"],
  );
  // The admin watches it (the manager made the change and is not mailed about it).
  expect(mail.map((m) => m.to_address)).toEqual(["admin@recurra.example"]);
});

test("a technician comments, watches and attaches a photo; a non-image is refused", async ({
  page,
}) => {
  await signIn(page, "technician");
  await page.goto("/known-issues");
  await page.getByRole("link", { name: /Loss of steering assist/ }).click();
  await expect(page.getByRole("form", { name: "Change state" })).toHaveCount(0);
  await expect(page.getByRole("link", { name: "Edit" })).toHaveCount(0);

  const comment = page.getByRole("form", { name: "Add a comment" });
  await comment.getByLabel("Comment").fill("Seen on two trucks this week, connector green.");
  await comment.getByRole("button", { name: "Add comment" }).click();
  await expect(page.getByTestId("history")).toContainText("connector green");

  await page.getByRole("button", { name: "Watch (e-mail me)" }).click();
  await expect(page.getByRole("button", { name: "Stop watching" })).toBeVisible();

  await page.getByLabel("Attach a photo").setInputFiles({
    name: "connector.png",
    mimeType: "image/png",
    buffer: PNG,
  });
  await expect(page.getByRole("img", { name: "Photo: connector.png" })).toBeVisible();
  await page.getByLabel("Attach a photo").setInputFiles({
    name: "notes.png",
    mimeType: "image/png",
    buffer: Buffer.from("this is not a picture"),
  });
  await expect(
    page.getByText("Only photos can be attached: JPEG, PNG, WebP or GIF."),
  ).toBeVisible();
  await screenshot(page, "known-issue-technician");
});

test("a viewer reads known issues but cannot write to them", async ({ page }) => {
  await signIn(page, "viewer");
  await page.goto("/known-issues");
  await expect(page.getByRole("link", { name: "New known issue" })).toHaveCount(0);
  const res = await page.goto("/known-issues/new");
  expect(res?.status()).toBe(403);
  const [issue] = await queryDb<{ id: number }>(
    "select k.id from known_issues k join organisations o on o.id = k.organisation_id where o.slug = 'tidewater' limit 1",
  );
  await page.goto(`/known-issues/${issue?.id}`);
  await expect(page.getByRole("form", { name: "Change state" })).toHaveCount(0);
  await expect(page.getByRole("form", { name: "Add a comment" })).toHaveCount(0);
  const upload = await page.request.put(`/api/known-issues/${issue?.id}/attachments?name=a.png`, {
    data: PNG,
  });
  expect(upload.status()).toBe(403);
  // Another organisation's known issue reads as missing.
  const [other] = await queryDb<{ id: number }>(
    "select k.id from known_issues k join organisations o on o.id = k.organisation_id where o.slug = 'northgate' limit 1",
  );
  expect((await page.goto(`/known-issues/${other?.id}`))?.status()).toBe(404);
});

test("vehicle names link to their pages only for roles that may open them", async ({
  browser,
  baseURL,
}) => {
  // The first Tidewater known issue; its page lists the vehicles affected and at risk.
  const [issue] = await queryDb<{ id: number }>(
    `select k.id from known_issues k join organisations o on o.id = k.organisation_id
      where o.slug = 'tidewater' order by k.id limit 1`,
  );
  const linkCounts: Record<string, number> = {};
  for (const role of ["manager", "viewer"] as const) {
    await asRole(browser, baseURL, role, async (page) => {
      await page.goto(`/known-issues/${issue?.id}`);
      const affected = page.getByRole("heading", { name: /^Vehicles affected \(\d+\)$/ });
      await expect(affected).toBeVisible();
      linkCounts[role] = await page.locator('main a[href^="/vehicles/"]').count();
      if (role === "viewer") {
        // Every vehicle link is refused to a viewer: none is offered, the names are still shown.
        expect(await page.locator("main [data-vehicle-id]").count()).toBeGreaterThan(0);
        expect(await page.locator("main a[data-vehicle-id]").count()).toBe(0);
        for (const href of await page
          .locator("main a[href]")
          .evaluateAll((as) => as.map((a) => a.getAttribute("href") ?? ""))) {
          if (href.startsWith("/")) {
            const res = await page.request.get(href);
            expect(res.status(), href).toBeLessThan(400);
          }
        }
      }
    });
  }
  expect(linkCounts.manager).toBeGreaterThan(0);
  expect(linkCounts.viewer).toBe(0);
});
