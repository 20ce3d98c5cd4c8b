import { expect, test } from "@playwright/test";
import { DEMO_PASSWORD, SignInPage } from "./pages/sign-in-page";

test("a researcher looks up a solvent and reads its vapor pressure, flammability and sources", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("researcher@example.org", DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/$/);

  await page.getByRole("navigation", { name: "Main" }).first().getByRole("link", { name: "Substances" }).click();
  await expect(page.getByRole("heading", { name: "Substances", level: 1 })).toBeVisible();
  await page.getByRole("link", { name: "diethyl ether" }).click();

  await expect(page.getByRole("heading", { name: "diethyl ether", level: 1 })).toBeVisible();
  await expect(page.getByText("CAS 60-29-7")).toBeVisible();
  // Diethyl ether at 20 °C: 442 mmHg = 58.9 kPa (National Research Council, Prudent Practices in the
  // Laboratory, 1995, LCSS); the page shows the correlation value, within 2 % of it.
  const psat = page.locator("dl > div", { hasText: "Psat at 20 °C" });
  await expect(psat).toContainText(/5[89]\.\d kPa/);
  await expect(page.locator("dl > div", { hasText: "Classification" })).toContainText("GHS Cat. 1");
  await expect(page.getByRole("img", { name: /Saturation vapor pressure from −40 to 60 °C/ })).toBeVisible();
  // The lower flammable temperature lies close to the closed-cup flash point, −45 °C (IEC 60079-20-1),
  // below the chart's −40 °C, and the chart says so.
  await expect(page.locator("dl > div", { hasText: "Lower flammable temperature" })).toContainText("−45");
  await expect(page.getByText("below the chart's range")).toBeVisible();
  await expect(page.getByRole("rowheader", { name: "Flash point (closed cup)" })).toBeVisible();
  await expect(page.getByRole("complementary", { name: "Caution" })).toContainText("not air monitoring");
});
