import { encode } from "next-auth/jwt";
import { ACCOUNTS, expect, PASSWORD, queryDb, screenshot, signIn, test } from "./support";

test.describe("sign-in", () => {
  test("lists the demo accounts in demo mode", async ({ page }) => {
    await page.goto("/sign-in");
    const demo = page.getByRole("region", { name: "Demo accounts" });
    for (const email of Object.values(ACCOUNTS)) await expect(demo).toContainText(email);
    await screenshot(page, "sign-in");
  });

  test("a wrong password and an unknown user get the same clear message", async ({ page }) => {
    const messages: string[] = [];
    for (const [email, password] of [
      [ACCOUNTS.manager, "not-the-password"],
      ["nobody@recurra.example", PASSWORD],
    ] as const) {
      await page.goto("/sign-in");
      await page.getByLabel("E-mail").fill(email);
      await page.getByLabel("Password").fill(password);
      await page.getByRole("button", { name: "Sign in" }).click();
      const alert = page.getByRole("alert").filter({ hasText: /\S/ });
      await expect(alert).toContainText("do not match an account");
      messages.push((await alert.textContent()) ?? "");
      await expect(page).toHaveURL(/\/sign-in/);
      // The password typed is not echoed back anywhere on the page.
      if (password !== PASSWORD) await expect(page.locator("body")).not.toContainText(password);
    }
    expect(messages[0]).toBe(messages[1]);
    await screenshot(page, "sign-in-error");
  });

  test("signed-out visitors are sent to sign-in, and API calls get 401", async ({ page }) => {
    await page.goto("/vehicles");
    await expect(page).toHaveURL(/\/sign-in$/);
    const res = await page.request.get("/api/overview");
    expect(res.status()).toBe(401);
  });

  test("an expired session is told so and must sign in again", async ({
    page,
    context,
    baseURL,
  }) => {
    const [user] = await queryDb<{ id: number }>("select id from users where email = ?", [
      ACCOUNTS.manager,
    ]);
    // A real session token signed with the server's secret, but already past its expiry.
    const token = await encode({
      token: { uid: Number(user?.id), oid: null, email: ACCOUNTS.manager },
      secret: process.env.NEXTAUTH_SECRET ?? "",
      maxAge: -60,
    });
    await context.addCookies([
      { name: "next-auth.session-token", value: token, url: baseURL ?? "" },
    ]);
    // The API says so (before the page visit below, where next-auth clears the dead cookie).
    const res = await page.request.get("/api/overview");
    expect(res.status()).toBe(401);
    expect((await res.json()).error).toMatch(/session has ended/);
    await page.goto("/");
    await expect(page).toHaveURL(/\/sign-in\?reason=expired/);
    await expect(page.getByRole("status")).toContainText("Your session has ended");
  });

  test("sign out ends the session", async ({ page }) => {
    await signIn(page, "viewer");
    await page.getByRole("button", { name: "Sign out" }).click();
    await expect(page).toHaveURL(/\/sign-in\?reason=signed-out/);
    await expect(page.getByRole("status")).toContainText("You have signed out");
    await page.goto("/");
    await expect(page).toHaveURL(/\/sign-in/);
  });
});
