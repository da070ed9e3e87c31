import { expect, test } from "@playwright/test";
import { SignInPage } from "./signin-page";
import { credentials, screenshot } from "./support";

test("an unsigned visitor is sent to the sign-in page", async ({ page }) => {
  await page.goto("/network");
  await expect(page).toHaveURL(/\/signin/);
});

test("a wrong password is refused with a message and no session", async ({ page }) => {
  const [user] = credentials();
  await page.goto("/signin");
  await page.getByLabel("E-mail").fill(user.email);
  await page.getByLabel("Password").fill("not-the-password");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByText("E-mail or password is not right")).toBeVisible();
  await page.goto("/network");
  await expect(page).toHaveURL(/\/signin/);
});

for (const user of credentials()) {
  test(`the ${user.role} ${user.email} signs in and sees the demo network's cells`, async ({ page }) => {
    await new SignInPage(page).signIn(user);
    await page.goto("/network");
    const table = page.getByTestId("cells-table");
    await expect(table).toBeVisible();
    const rows = table.locator("tbody tr");
    expect(await rows.count()).toBeGreaterThanOrEqual(24);
    await expect(page.getByRole("heading", { level: 1 })).toContainText("Quillhaven");
    if (user.role === "engineer") await screenshot(page, "network-cells");
  });
}
