import { expect, test } from "@playwright/test";
import { LogContainerPage } from "./pages/log-container-page";
import { DEMO_PASSWORD, SignInPage } from "./pages/sign-in-page";

// Runs before register.spec.ts, which moves the demo's diethyl ether out of FR-1.
test("a researcher logging diethyl ether into the domestic-type refrigerator FR-1 is told it is already critical there before saving", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("researcher@example.org", DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/$/);

  const form = new LogContainerPage(page);
  await form.goto();
  await expect(form.whatIf()).toContainText("Choose the storage unit, the substance or mixture and the amount");
  await form.fillLabel(`WI-${Date.now().toString().slice(-6)}`);
  await form.chooseSubstance("60-29-7", /diethyl ether/);
  await expect(page.getByText("✓ diethyl ether · CAS 60-29-7")).toBeVisible();
  await form.setAmount("1", "L");
  await form.chooseStorageUnit("FR-1 Refrigerator (domestic type)");

  // The demo's two ether bottles already saturate FR-1 if it fails: one more litre raises nothing
  // new, and the panel says so plainly instead of "nothing new".
  const whatIf = form.whatIf();
  await expect(whatIf.getByText(/^Already flagged here \(severity critical\)$/)).toBeVisible();
  await expect(whatIf.getByText(/^Already critical here: diethyl ether in FR-1 could reach 4,650 % LFL if the refrigerator fails \(control lost, 28\.0 °C\)\. Storing more keeps it so\./)).toBeVisible();
  await expect(whatIf.getByText("Critical").first()).toBeVisible();
  await expect(whatIf.getByText(/Nothing new/)).toHaveCount(0);
  const standing = whatIf.getByRole("link", { name: "Diethyl ether in FR-1 could reach 4,650 % LFL if the refrigerator fails (control lost, 28.0 °C)" });
  await expect(standing).toHaveAttribute("href", /^\/register\/\d+$/);
  await expect(whatIf.getByLabel("Caution")).toBeVisible();
  // Advice only: saving stays possible.
  await expect(form.saveButton()).toBeEnabled();

  // The same litre in the flammable-storage refrigerator next door: the verdict follows the unit.
  await form.chooseStorageUnit("FSR-1 Flammable-storage refrigerator");
  await expect(whatIf.getByText(/FSR-1/).first()).toBeVisible();
  await expect(whatIf.getByText(/^Already critical here: diethyl ether in FR-1/)).toHaveCount(0);
});

test("a researcher whose placement is flagged gets a safer unit in one click", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("researcher@example.org", DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/$/);

  const form = new LogContainerPage(page);
  await form.goto();
  await form.fillLabel(`SP-${Date.now().toString().slice(-6)}`);
  await form.chooseSubstance("68-12-2", /dimethylformamide/);
  await form.setAmount("1", "L");
  await form.chooseStorageUnit("FR-1 Refrigerator (domestic type)");

  // A domestic-type refrigerator is flagged for it; the under-hood cabinet in the same room is not.
  const whatIf = form.whatIf();
  await expect(whatIf.getByText("Would raise findings here")).toBeVisible();
  const safer = form.saferPlaces();
  await expect(safer.getByRole("heading", { name: "Safer places nearby" })).toBeVisible();
  await expect(safer.getByRole("listitem").first()).toContainText("FC-3");
  await expect(safer.getByRole("listitem").first()).toContainText("Nothing raised");
  await expect(safer.getByRole("listitem").first()).toContainText("Nothing would be raised here.");

  await form.choosePlace("FC-3", "2.107");
  await expect(form.chosenStorageUnit()).toHaveText("FC-3 Under-hood flammable cabinet");
  // The what-if runs again for the chosen unit.
  await expect(whatIf.getByText("Nothing flagged about this here")).toBeVisible();
  await expect(form.saferPlaces()).toHaveCount(0);
  await expect(form.saveButton()).toBeEnabled();
});
