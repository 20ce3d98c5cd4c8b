import { expect, test } from "@playwright/test";
import { InstitutionSignIn } from "./pages/institution-sign-in";
import { DEMO_PASSWORD, Shell, SignInPage } from "./pages/sign-in-page";

test("a person invited for single sign-on signs in through the institution with their group's role, and is refused once the group is gone", async ({ page, request }) => {
  const signIn = new SignInPage(page);
  const shell = new Shell(page);
  const institution = new InstitutionSignIn(page, request);
  // The demo invites Ines Calloway; her group research-staff maps to Researcher. A reused server may have changed it.
  await institution.setGroups("ines", ["research-staff"]);

  await signIn.goto();
  await institution.signIn("ines", DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/$/);
  await expect(page.getByRole("heading", { level: 1 })).toContainText("Ines");
  // A researcher's navigation: no Temperatures, Exports or Admin.
  expect(await shell.navLabels()).toEqual(["Overview", "Register", "Inventory", "Locations", "Substances"]);
  await page.goto("/admin");
  await expect(page.getByRole("heading", { name: "Your role does not open this page" })).toBeVisible();
  await page.goto("/");
  await shell.signOut();

  await institution.setGroups("ines", []);
  await institution.signIn("ines", DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/sso\/refused$/);
  await expect(page.getByRole("heading", { name: "Your institution's groups give no access to Headroom" })).toBeVisible();
  await expect(page.getByText("ines.calloway@example.org")).toBeVisible();
  await expect(page.getByText("none", { exact: true })).toBeVisible();
  const anonymous = await page.goto("/locations");
  expect(anonymous?.url()).toMatch(/\/sign-in$/);
});
