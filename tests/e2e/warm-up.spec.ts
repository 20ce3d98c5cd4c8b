import { expect, test, type Page } from "@playwright/test";
import { DEMO_PASSWORD, SignInPage } from "./pages/sign-in-page";

/** The id of a demo unit by its code, through the JSON API with the page's session. */
async function unitId(page: Page, code: string): Promise<number> {
  const cookie = (await page.context().cookies()).map((c) => `${c.name}=${c.value}`).join("; ");
  const res = await page.request.get(`/api/v1/storage-units?q=${encodeURIComponent(code)}`, { headers: { cookie } });
  return ((await res.json()) as { data: { id: number; code: string }[] }).data.find((u) => u.code === code)!.id;
}

test("facilities sees the warm-up fitted to the demo refrigerator's weekend failure, sets τ with a note, is told when a value is out of range, and clears it back to the fit", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("facilities@example.org", DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/$/);

  await page.goto(`/locations/units/${await unitId(page, "FSR-1")}`);
  const card = page.locator("section").filter({ has: page.getByRole("heading", { name: "Warm-up after a failure", exact: true }) });
  await expect(card.getByText("Fitted to this unit's recorded failures")).toBeVisible();
  await expect(card.getByText(/^Fitted warm-up, τ = 4 h/)).toBeVisible();
  await expect(card.getByRole("table", { name: /Every fit of this unit's warm-up/ })).toBeVisible();

  const tau = page.getByLabel("Warm-up time constant τ (min)");
  await tau.fill("2");
  await page.getByRole("button", { name: "Save storage unit" }).click();
  await expect(page.getByText("Warm-up time constant τ must be from 5 to 43200 min.")).toBeVisible();

  await tau.fill("180");
  await page.getByLabel("Why this τ").fill("Door seal worn; checked with the unit emptied.");
  await page.getByRole("button", { name: "Save storage unit" }).click();
  await expect(card.getByText("Set by a person")).toBeVisible();
  await expect(card.getByText(/^τ = 3 h, set for this unit by a person \(“Door seal worn; checked with the unit emptied\.”\)/)).toBeVisible();

  await page.getByLabel("Warm-up time constant τ (min)").fill("");
  await page.getByRole("button", { name: "Save storage unit" }).click();
  await expect(card.getByText("Fitted to this unit's recorded failures")).toBeVisible();
  await expect(card.getByText(/Door seal worn/)).toHaveCount(0);
  // The note went with the set τ: the stored unit has none.
  await page.reload();
  await expect(page.getByLabel("Why this τ")).toHaveValue("");
});
