import { expect, type APIRequestContext, type Page } from "@playwright/test";
import { OIDC_FAKE_URL } from "../../../playwright.config";

/** The local OpenID Connect provider's login form and its control endpoint. */
export class InstitutionSignIn {
  constructor(
    private readonly page: Page,
    private readonly request: APIRequestContext,
  ) {}

  /** From Headroom's sign-in page through the provider's form and back. */
  async signIn(login: string, password: string) {
    await this.page.getByRole("link", { name: "Sign in with your institution" }).click();
    await expect(this.page.getByRole("heading", { name: "Institution sign-in" })).toBeVisible();
    await this.page.getByLabel("Login").fill(login);
    await this.page.getByLabel("Password").fill(password);
    await this.page.getByRole("button", { name: "Continue" }).click();
  }

  async setGroups(login: string, groups: string[]) {
    const response = await this.request.post(`${OIDC_FAKE_URL}/people/${login}/groups`, { data: { groups } });
    expect(response.status()).toBe(200);
  }
}
