import { execFileSync } from "node:child_process";
import { asRole, expect, orgId, queryDb, screenshot, signIn, test } from "./support";

const LINK = /https?:\/\/[^\s]+\/invite\/[A-Za-z0-9_-]{43}/;

test("admin invites a technician by e-mail; the invitee creates an account and lands in the organisation", async ({
  page,
  browser,
  baseURL,
}) => {
  const email = `tech-${Date.now()}@recurra.example`;
  await signIn(page, "admin");
  const orgName = (await page.getByRole("heading", { level: 1 }).textContent()) ?? "";
  expect(orgName).not.toBe("");

  await page.goto("/settings/members");
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Members");
  const form = page.getByRole("form", { name: "Invite a member" });
  // Bad input gets a clear message and keeps what was typed.
  await form.getByLabel("E-mail").fill("not-an-address");
  await form.getByRole("button", { name: "Send invitation" }).click();
  await expect(form.getByText("Enter a valid e-mail address.")).toBeVisible();
  await expect(form.getByLabel("E-mail")).toHaveValue("not-an-address");

  await form.getByLabel("E-mail").fill(email);
  await form.getByLabel("Role").selectOption("technician");
  await form.getByRole("button", { name: "Send invitation" }).click();
  await expect(form.getByRole("status")).toContainText(`Invitation sent to ${email}`);
  const pending = page.getByRole("region", { name: "Pending invitations" });
  await expect(pending.getByRole("row", { name: new RegExp(email) })).toContainText("Technician");
  await screenshot(page, "members-invited");

  // The message goes through SMTP to the app's local capture; the admin reads it in the app.
  const item = page.getByRole("listitem").filter({ hasText: `To ${email}` });
  await expect(async () => {
    await page.goto("/settings/mail");
    await expect(item).toBeVisible({ timeout: 1_000 });
  }).toPass({ timeout: 30_000 });
  await expect(item).toContainText(`Join ${orgName} on Recurra`);
  await item.locator("summary").click();
  const text = (await item.getByTestId("mail-text").textContent()) ?? "";
  const link = text.match(LINK)?.[0] ?? "";
  expect(link.startsWith(`${baseURL}/invite/`), `link in: ${text}`).toBe(true);
  await expect(item.locator("iframe")).toHaveAttribute("sandbox", "");
  await screenshot(page, "captured-mail");
  // The capture store holds it once, filed under the inviting organisation.
  const stored = await queryDb<{ organisation_id: number; subject: string }>(
    "select organisation_id, subject from captured_mail where to_addresses = ?",
    [email],
  );
  const orgIds = [await orgId("tidewater"), await orgId("northgate")];
  expect(stored).toHaveLength(1);
  expect(orgIds).toContain(Number(stored[0]?.organisation_id));

  // The invitee opens the link in a browser of their own.
  const context = await browser.newContext({ baseURL });
  const invitee = await context.newPage();
  const errors: string[] = [];
  invitee.on("pageerror", (e) => errors.push(e.message));
  await invitee.goto(link);
  await expect(invitee.getByRole("heading", { level: 1 })).toHaveText(`Join ${orgName}`);
  await expect(invitee.getByText(email)).toBeVisible();
  await invitee.getByLabel("Your name").fill("Ottilie Marchbank");
  await invitee.getByLabel(/^Password(?! again)/).fill("short");
  await invitee.getByLabel("Password again").fill("short");
  await invitee.getByRole("button", { name: "Create account and join" }).click();
  await expect(invitee.locator("#password-error")).toHaveText("At least 10 characters.");
  await expect(invitee.getByLabel("Your name")).toHaveValue("Ottilie Marchbank");
  await invitee.getByLabel(/^Password(?! again)/).fill("bay-four-lift-2026");
  await invitee.getByLabel("Password again").fill("bay-four-lift-2026");
  await invitee.getByRole("button", { name: "Create account and join" }).click();
  await invitee.waitForURL((url) => url.pathname === "/");
  await expect(invitee.getByTestId("who")).toHaveText("Ottilie Marchbank · Technician");
  await expect(invitee.getByRole("heading", { level: 1 })).toHaveText(orgName);
  await screenshot(invitee, "invitee-home");

  // The link is used up, and a technician may not manage members.
  await invitee.goto(link);
  await expect(invitee.getByRole("alert").filter({ hasText: "already been used" })).toBeVisible();
  const refused = await invitee.goto("/settings/members");
  expect(refused?.status()).toBe(403);
  expect(errors).toEqual([]);
  await context.close();

  // The admin now sees a member where the invitation was.
  await page.goto("/settings/members");
  await expect(
    page.getByRole("region", { name: "Members and roles" }).getByRole("row", { name: /Ottilie/ }),
  ).toContainText(email);
  await expect(pending.getByRole("row", { name: new RegExp(email) })).toHaveCount(0);
  const [member] = await queryDb<{ role: string }>(
    `select m.role from memberships m join users u on u.id = m.user_id
      where u.email = ? and m.organisation_id = ?`,
    [email, Number(stored[0]?.organisation_id)],
  );
  expect(member?.role).toBe("technician");
});

test("viewer and technician are refused the members and mail pages (403)", async ({
  browser,
  baseURL,
}) => {
  for (const role of ["viewer", "technician"] as const) {
    await asRole(browser, baseURL, role, async (page) => {
      for (const path of ["/settings/members", "/settings/mail"]) {
        const res = await page.goto(path);
        expect(res?.status(), `${role} ${path}`).toBe(403);
        await expect(page.getByRole("heading", { level: 1 })).toHaveText(
          "Your role cannot open this page",
        );
      }
    });
  }
});

test("an unknown or malformed invitation link gets a clear message", async ({ page }) => {
  for (const token of ["not-a-token", "A".repeat(43)]) {
    await page.goto(`/invite/${token}`);
    await expect(page.getByRole("heading", { level: 1 })).toHaveText(
      "This invitation cannot be used",
    );
    await expect(
      page.getByRole("alert").filter({ hasText: "This invitation link is not valid." }),
    ).toBeVisible();
  }
});

test("someone with an account signs in from the link and joins a second organisation", async ({
  page,
  browser,
  baseURL,
}) => {
  const email = `driver-${Date.now()}@recurra.example`;
  const password = "north-bay-lift-7";
  execFileSync(
    "npx",
    [
      "tsx",
      "--conditions=react-server",
      "jobs/cli.ts",
      "user",
      "add",
      "--org",
      "tidewater",
      "--role",
      "viewer",
      "--email",
      email,
      "--name",
      "Linnea Frostholm",
      "--password",
      password,
    ],
    { env: process.env, stdio: "ignore" },
  );

  await signIn(page, "admin");
  await page.getByLabel("Organisation").selectOption({ label: "Northgate Auto Clinic (Admin)" });
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Northgate Auto Clinic");
  await page.goto("/settings/members");
  const form = page.getByRole("form", { name: "Invite a member" });
  await form.getByLabel("E-mail").fill(email);
  await form.getByLabel("Role").selectOption("manager");
  await form.getByRole("button", { name: "Send invitation" }).click();
  await expect(form.getByRole("status")).toContainText(`Invitation sent to ${email}`);

  // This time the test reads the capture store directly.
  let link = "";
  await expect
    .poll(
      async () => {
        const [row] = await queryDb<{ text_body: string }>(
          "select text_body from captured_mail where to_addresses = ?",
          [email],
        );
        link = row?.text_body.match(LINK)?.[0] ?? "";
        return link;
      },
      { timeout: 30_000 },
    )
    .toContain(`${baseURL}/invite/`);

  const context = await browser.newContext({ baseURL });
  const invitee = await context.newPage();
  await invitee.goto(link);
  await expect(invitee.getByRole("heading", { level: 1 })).toHaveText("Join Northgate Auto Clinic");
  await invitee.getByRole("link", { name: "Sign in to join" }).click();
  await invitee.getByLabel("E-mail").fill(email);
  await invitee.getByLabel("Password").fill(password);
  await invitee.getByRole("button", { name: "Sign in" }).click();
  await invitee.waitForURL((url) => url.pathname.startsWith("/invite/"));
  await invitee.getByRole("button", { name: "Join Northgate Auto Clinic" }).click();
  await invitee.waitForURL((url) => url.pathname === "/");
  await expect(invitee.getByRole("heading", { level: 1 })).toHaveText("Northgate Auto Clinic");
  await expect(invitee.getByTestId("who")).toHaveText("Linnea Frostholm · Manager");
  // Still a viewer in the first organisation.
  await expect(invitee.getByLabel("Organisation")).toContainText("Tidewater Parcel Co-op (Viewer)");
  await context.close();
});
