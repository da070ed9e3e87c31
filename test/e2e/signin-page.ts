import { expect, type Page } from "@playwright/test";
import type { Credential } from "./support";

/** Page object of the sign-in screen. */
export class SignInPage {
  constructor(private readonly page: Page) {}

  async signIn(user: Credential) {
    await this.page.goto("/signin");
    await this.page.getByLabel("E-mail").fill(user.email);
    await this.page.getByLabel("Password").fill(user.password);
    await this.page.getByRole("button", { name: "Sign in" }).click();
    await expect(this.page.getByTestId("who")).toContainText(user.name);
  }
}
