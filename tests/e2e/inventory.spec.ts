import { expect, test } from "@playwright/test";
import { DEMO_PASSWORD, SignInPage } from "./pages/sign-in-page";

test("a researcher logs a container by scanning its label, then finds it again by scanning", async ({ page }) => {
  const label = `HR-${Date.now().toString().slice(-6)}`;
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("researcher@example.org", DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/$/);

  await page.goto("/inventory");
  await page.getByRole("link", { name: "Log a container" }).click();
  await expect(page.getByRole("heading", { name: "Log a container" })).toBeVisible();

  // A scanner types the label into the focused field and presses Enter: the form must not submit.
  await expect(page.getByLabel("Label or barcode")).toBeFocused();
  await page.keyboard.type(label);
  await page.keyboard.press("Enter");
  await expect(page).toHaveURL(/\/inventory\/new/);
  await expect(page.getByRole("combobox", { name: "Substance" })).toBeFocused();

  await page.keyboard.type("67-64-1");
  await page.getByRole("option", { name: /acetone/ }).click();
  await expect(page.getByText("✓ acetone · CAS 67-64-1")).toBeVisible();
  await page.getByLabel("Amount", { exact: true }).fill("2.5");
  await page.getByLabel("Unit", { exact: true }).selectOption("L");
  await page.getByLabel("Storage unit").selectOption({ label: "FSR-1 Flammable-storage refrigerator" });
  await page.getByLabel("State").selectOption("opened");

  // A mistake is shown under its field and what was typed stays.
  await page.getByLabel("Capacity (optional)").fill("1");
  await page.getByLabel("Capacity unit").selectOption("L");
  await page.getByRole("button", { name: "Log container" }).click();
  await expect(page.getByText("The amount is more than the container's capacity.")).toBeVisible();
  await expect(page.getByLabel("Label or barcode")).toHaveValue(label);
  await page.getByLabel("Capacity (optional)").fill("4");
  await page.getByRole("button", { name: "Log container" }).click();

  await expect(page.getByRole("heading", { name: label, level: 1 })).toBeVisible();
  await expect(page.getByText(`Logged ${label}.`)).toBeVisible();
  await expect(page.getByText("acetone · 2.5 L of 4 L · Opened")).toBeVisible();
  await expect(page.getByRole("link", { name: /North Campus · 2.115 \/ FSR-1/ })).toBeVisible();

  await page.goto("/inventory");
  await expect(page.getByRole("table", { name: "Containers" }).getByRole("link", { name: label })).toBeVisible();
  await page.getByLabel("Scan or type a label").fill(label);
  await page.keyboard.press("Enter");
  await expect(page.getByRole("heading", { name: label, level: 1 })).toBeVisible();

  await page.goto("/inventory");
  await page.getByLabel("Scan or type a label").fill("NO-SUCH-LABEL");
  await page.keyboard.press("Enter");
  await expect(page.locator("#label-lookup-error")).toHaveText("No container has the label “NO-SUCH-LABEL”.");
});

test("an auditor reads inventory, locations and substances but finds no control that changes anything", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("auditor@example.org", DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/$/);

  const writeControls = /^(Log a container|Log container|Save|Save changes|Save room|Save storage unit|Move|Mark .*|Correct values|Retire|Restore to the library|Add a substance|Add room|Add storage unit|Define mixture|Send invitation|Deactivate|Import)$/;
  for (const path of ["/inventory", "/locations", "/substances", "/substances/1", "/inventory/mixtures", "/exports", "/exports/audit"]) {
    await page.goto(path);
    await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
    await expect(page.getByRole("button", { name: writeControls })).toHaveCount(0);
    await expect(page.getByRole("link", { name: writeControls })).toHaveCount(0);
    // The only forms are the read-only label look-up, downloads (method GET) and signing out.
    await expect(page.locator('main form:not([role=search]):not([method="get"])')).toHaveCount(0);
  }

  await page.goto("/locations");
  await page.getByRole("link", { name: /B-014 Solvent store/ }).click();
  await expect(page.getByRole("heading", { name: "B-014 Solvent store" })).toBeVisible();
  await expect(page.getByText("72.0 m³").or(page.getByText("72 m³"))).toBeVisible();
  await expect(page.locator("main form")).toHaveCount(0);

  await page.goto("/exports/audit");
  await expect(page.getByText(/events? match/)).toBeVisible();
  const direct = await page.goto("/inventory/new");
  expect(direct?.status()).not.toBe(500);
  await expect(page.getByRole("heading", { name: "Your role does not open this page" })).toBeVisible();
});
