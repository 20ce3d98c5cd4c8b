import { expect, type Page } from "@playwright/test";

export const DEMO_PASSWORD = "headroom-demo";

export class SignInPage {
  constructor(private readonly page: Page) {}

  async goto() {
    await this.page.goto("/sign-in");
    await expect(this.page.getByRole("heading", { name: "Sign in to Headroom" })).toBeVisible();
  }

  async signIn(email: string, password: string) {
    await this.page.getByLabel("E-mail address").fill(email);
    await this.page.getByLabel("Password", { exact: true }).fill(password);
    await this.page.getByRole("button", { name: "Sign in" }).click();
  }

  async expectError(text: string | RegExp) {
    await expect(this.page.getByRole("alert").filter({ hasText: text })).toBeVisible();
  }
}

export class Shell {
  constructor(private readonly page: Page) {}

  nav() {
    return this.page.getByRole("navigation", { name: "Main" }).first();
  }

  async navLabels(): Promise<string[]> {
    return (await this.nav().getByRole("link").allInnerTexts()).map((t) => t.trim());
  }

  async signOut() {
    await this.page.getByRole("button", { name: "Sign out" }).first().click();
    await expect(this.page).toHaveURL(/\/sign-in/);
  }
}
