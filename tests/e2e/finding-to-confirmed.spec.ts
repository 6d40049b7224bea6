import { expect, orgId, queryDb, screenshot, signIn, test } from "./support";

const TITLE = "Stalls just after refuelling: purge valve sticking open";

/**
 * The known-issue loop end to end: a technician's finding in the bay becomes evidence; the
 * manager sees it and confirms the known issue; its watcher's e-mail goes through SMTP into the
 * local capture.
 */
test("a finding in the bay raises the evidence; the manager confirms; the watcher is e-mailed", async ({
  browser,
  baseURL,
}) => {
  const north = await orgId("northgate");
  const [v] = await queryDb<{ vin: string; last_odometer_mi: number }>(
    `select v.vin, v.last_odometer_mi from vehicles v join generations g on g.id = v.generation_id
      where v.organisation_id = ? and v.model = 'Kestrel' and g.label = 'K2' and v.vin is not null
        and v.last_odometer_mi is not null order by v.id limit 1`,
    [north],
  );
  const [issue] = await queryDb<{ id: number }>(
    "select id from known_issues where organisation_id = ? and title = ?",
    [north, TITLE],
  );

  // The manager's view before.
  const managerContext = await browser.newContext({ baseURL });
  const manager = await managerContext.newPage();
  await signIn(manager, "shopManager");
  await manager.goto(`/known-issues/${issue?.id}`);
  const before = Number(await manager.getByTestId("evidence-confirmed").textContent());

  // The technician looks the vehicle up and records that the purge valve was the cause.
  const techContext = await browser.newContext({ baseURL });
  const tech = await techContext.newPage();
  await signIn(tech, "technician");
  await tech.goto(
    `/lookup?vin=${v?.vin}&odometer=${Math.round(Number(v?.last_odometer_mi))}&dtc=P0496`,
  );
  const first = tech.getByTestId("cause").first();
  await expect(first.getByRole("heading", { level: 3 })).toContainText(TITLE);
  await expect(first.getByTestId("checks").getByRole("listitem").first()).toBeVisible();
  await expect(first.getByTestId("cautions")).toContainText("Fuel vapour");
  await first.getByRole("button", { name: "This was the cause" }).click();
  await expect(first.getByRole("status")).toContainText("Recorded: this was the cause");

  // The manager sees the evidence count change, and confirms the known issue.
  await manager.reload();
  await expect(manager.getByTestId("evidence-confirmed")).toHaveText(String(before + 1));
  const stateForm = manager.getByRole("form", { name: "Change state" });
  await stateForm.getByLabel("Move to").selectOption("confirmed");
  await stateForm.getByLabel("Why").fill("Confirmed again in the bay today; the fix holds.");
  await stateForm.getByRole("button", { name: "Change state" }).click();
  await expect(manager.getByTestId("state-badge").first()).toHaveText("Confirmed");
  await screenshot(manager, "known-issue-confirmed");

  // The admin watches it: the message arrives through SMTP in the local capture.
  await expect(async () => {
    const mail = await queryDb<{ subject: string; text_body: string }>(
      "select subject, text_body from captured_mail where to_addresses = ? and subject = ?",
      ["admin@recurra.example", `Known issue confirmed: ${TITLE}`],
    );
    expect(mail).toHaveLength(1);
    expect(mail[0]?.text_body).toContain("Confirmed again in the bay today");
  }).toPass({ timeout: 30_000 });

  // A technician cannot change its state.
  await tech.goto(`/known-issues/${issue?.id}`);
  await expect(tech.getByRole("form", { name: "Change state" })).toHaveCount(0);
  await managerContext.close();
  await techContext.close();
});
