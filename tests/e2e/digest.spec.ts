import { execFileSync } from "node:child_process";
import { expect, queryDb, signIn, test } from "./support";

test("the weekly digest goes through SMTP into the local capture with the new signals", async ({
  page,
}) => {
  // The manager opts out and in again on the Account page (the demo has them opted in).
  await signIn(page, "manager");
  await page.getByRole("link", { name: "Account" }).click();
  const form = page.getByRole("form", { name: "Weekly digest" });
  await expect(form.getByTestId("digest-state")).toHaveText("You get the digest.");
  await form.getByRole("button", { name: "Stop the digest" }).click();
  await expect(form.getByTestId("digest-state")).toHaveText("You do not get the digest.");
  await form.getByRole("button", { name: "Send me the digest" }).click();
  await expect(form.getByTestId("digest-state")).toHaveText("You get the digest.");

  // The command line sends this week's digest; the app's mailer delivers it to the capture.
  const out = execFileSync(
    "npx",
    [
      "tsx",
      "--conditions=react-server",
      "jobs/cli.ts",
      "digest",
      "--org",
      "tidewater",
      "--force",
      "--json",
    ],
    { env: process.env },
  ).toString();
  const result = JSON.parse(out.trim().split("\n").at(-1) ?? "{}") as {
    recipients: number;
    newSignals: number;
  };
  expect(result.recipients).toBeGreaterThanOrEqual(2);
  expect(result.newSignals).toBeGreaterThan(0);
  const [signal] = await queryDb<{ make: string; model: string; cohort_label: string }>(
    `select s.make, s.model, s.cohort_label from signals s join organisations o on o.id = s.organisation_id
      where o.slug = 'tidewater' order by s.ratio_lower desc limit 1`,
  );
  await expect(async () => {
    const mail = await queryDb<{ subject: string; text_body: string; html_body: string | null }>(
      `select subject, text_body, html_body from captured_mail
        where to_addresses = ? and subject like 'Recurra weekly digest: Tidewater%' order by id desc`,
      ["manager@recurra.example"],
    );
    expect(mail.length).toBeGreaterThan(0);
    expect(mail[0]?.text_body).toContain("NEW SIGNALS");
    expect(mail[0]?.text_body).toContain(
      `${signal?.make} ${signal?.model} ${signal?.cohort_label}`,
    );
    expect(mail[0]?.html_body).toContain("<h2");
    // Figures in plain words, faults by name, the organisation's confidence said once.
    expect(mail[0]?.text_body).toMatch(
      /: \d+ repairs?, (about [\d.]+ times|no repairs of this in) the rest of the fleet/,
    );
    expect(mail[0]?.text_body).toContain("“Likely” and “at least” are at 95% confidence");
    expect(mail[0]?.text_body).not.toMatch(/∞|\de-\d|[a-z]+-[a-z-]+\/[a-z]/);
  }).toPass({ timeout: 30_000 });
});
