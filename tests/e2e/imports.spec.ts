import { expect, test } from "@playwright/test";
import { DEMO_PASSWORD, SignInPage } from "./pages/sign-in-page";

const HEADER = "label,cas,amount,amount_unit,site,room,storage_unit,state";

function csv(rows: string[]): { name: string; mimeType: string; buffer: Buffer } {
  return { name: "storeroom-count.csv", mimeType: "text/csv", buffer: Buffer.from([HEADER, ...rows].join("\n") + "\n") };
}

test("a safety officer imports a file with errors, sees all of them, fixes the file, imports it and finds the containers", async ({ page }) => {
  const stamp = Date.now().toString().slice(-5);
  const good = [
    `IMP-${stamp}-1,67-64-1,2.5,L,North Campus,B-014,FC-1,sealed`,
    `IMP-${stamp}-2,64-17-5,1,L,North Campus,B-014,FC-2,opened`,
    `IMP-${stamp}-3,60-29-7,500,mL,North Campus,2.115,FSR-1,sealed`,
  ];
  const withErrors = [
    good[0],
    `IMP-${stamp}-2,64-17-4,1,L,North Campus,B-014,FC-2,opened`, // line 3: CAS check digit
    `IMP-${stamp}-3,60-29-7,-500,gallons,North Campus,2.115,FSR-9,sealed`, // line 4: amount, unit, storage unit
  ];

  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("safety@example.org", DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/$/);
  await page.goto("/inventory");
  await page.getByRole("link", { name: "Import containers" }).click();
  await expect(page.getByRole("heading", { level: 1 })).toBeVisible();

  const fileInput = page.getByLabel("Spreadsheet (CSV or XLSX, up to 10 MB)");
  await fileInput.setInputFiles(csv(withErrors));
  await page.getByRole("button", { name: "Check file" }).click();
  const issues = page.locator("table", { has: page.locator("caption", { hasText: /problems? on/ }) });
  await expect(issues.locator("caption")).toContainText("on 2 rows");
  await expect(issues.getByRole("row", { name: /^3 cas/ })).toContainText("64-17-4");
  for (const column of ["amount", "amount_unit", "storage_unit"]) {
    await expect(issues.getByRole("row", { name: new RegExp(`^4 ${column}\\b`) })).toBeVisible();
  }
  await expect(page.getByRole("button", { name: "Import", exact: true })).toBeDisabled();

  await fileInput.setInputFiles(csv(good));
  await page.getByRole("button", { name: "Check file" }).click();
  await expect(page.getByText("No problems found. The import writes every row in one go.")).toBeVisible();
  await page.getByRole("button", { name: "Import", exact: true }).click();
  await expect(page.getByRole("status").filter({ hasText: "Imported:" })).toContainText("3 containers created");

  await page.goto(`/inventory?q=IMP-${stamp}`);
  const table = page.getByRole("table", { name: "Containers" });
  await expect(page.getByText("3 containers match")).toBeVisible();
  for (const row of good) await expect(table.getByRole("link", { name: row.split(",")[0] })).toBeVisible();

  // Importing the same file again duplicates nothing.
  await page.goto("/imports/containers");
  await page.getByLabel("Spreadsheet (CSV or XLSX, up to 10 MB)").setInputFiles(csv(good));
  await page.getByRole("button", { name: "Check file" }).click();
  await page.getByRole("button", { name: "Import", exact: true }).click();
  await expect(page.getByRole("status").filter({ hasText: "Imported:" })).toContainText("0 containers created, 0 containers updated, 3 containers unchanged");
  await page.goto(`/inventory?q=IMP-${stamp}`);
  await expect(page.getByText("3 containers match")).toBeVisible();
});
