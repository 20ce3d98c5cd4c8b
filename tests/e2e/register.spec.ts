import ExcelJS from "exceljs";
import { expect, test, type Page } from "@playwright/test";
import { DEMO_PASSWORD, Shell, SignInPage } from "./pages/sign-in-page";

async function cookieHeader(page: Page): Promise<string> {
  return (await page.context().cookies()).map((c) => `${c.name}=${c.value}`).join("; ");
}

async function getJson<T>(page: Page, path: string): Promise<T> {
  const response = await page.request.get(path, { headers: { cookie: await cookieHeader(page) } });
  expect(response.ok()).toBe(true);
  return (await response.json()) as T;
}

test("a safety officer works a critical finding to resolution by moving the ether to a rated refrigerator, and an auditor downloads the workbook", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("safety@example.org", DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/$/);

  // The register opens on the findings that need work, most severe first.
  await page.getByRole("link", { name: "Register" }).first().click();
  await expect(page).toHaveURL(/\/register\?status=open/);
  // One line per problem by default; the by-location view opens on the worst location, the
  // domestic refrigerator FR-1 with its ether and acetone.
  await expect(page.getByRole("link", { name: "One line per problem" })).toHaveAttribute("aria-current", "page");
  await page.getByRole("link", { name: "By location" }).click();
  await expect(page).toHaveURL(/view=locations/);
  await expect(page.getByRole("list", { name: "Findings by location" }).getByRole("listitem").first()).toContainText("2.107 › FR-1");
  await page.getByRole("link", { name: "One line per problem" }).click();
  await expect(page).toHaveURL(/view=lines/);
  await page.getByRole("searchbox").or(page.getByLabel("Search")).first().fill("Diethyl ether (GHS category 1");
  // The search reaches the URL after a short pause; a click before it would be undone by it.
  await expect(page).toHaveURL(/[?&]q=Diethyl/);
  const findingLink = page.getByRole("link", { name: /^Diethyl ether \(GHS category 1, NFPA class IA\) is stored in FR-1, whose interior has ignition sources$/ });
  await expect(findingLink).toBeVisible();
  await findingLink.click();

  await expect(page.getByRole("heading", { level: 1 })).toContainText("is stored in FR-1, whose interior has ignition sources");
  await expect(page.getByText("Critical").first()).toBeVisible();
  await expect(page.getByRole("heading", { name: "Contributing containers (2)" })).toBeVisible();
  await expect(page.getByRole("heading", { name: "The whole working" })).toBeVisible();
  await expect(page.getByText("Step 1").first()).toBeVisible();
  await expect(page.getByLabel("Caution").first()).toBeVisible();
  const findingUrl = page.url();

  await page.getByRole("button", { name: "Start mitigation" }).click();
  await page.getByLabel("Mitigation plan").fill("Move the diethyl ether to the flammable-storage refrigerator FSR-1 in 2.115 today.");
  await page.getByLabel("Owner of the mitigation").selectOption({ index: 1 });
  await page.getByRole("button", { name: "Save: start mitigation" }).click();
  await expect(page.getByText("Mitigation started.")).toBeVisible();
  await expect(page.getByText("Mitigating").first()).toBeVisible();

  // Move every ether bottle out of FR-1.
  const units = await getJson<{ data: { id: number; code: string }[] }>(page, "/api/v1/storage-units?q=FR-1");
  const fr1 = units.data.find((u) => u.code === "FR-1")!;
  const ether = await getJson<{ data: { id: number }[] }>(page, "/api/v1/substances?q=diethyl%20ether");
  const bottles = await getJson<{ data: { id: number }[] }>(page, `/api/v1/containers?storageUnitId=${fr1.id}&substanceId=${ether.data[0].id}`);
  expect(bottles.data.length).toBeGreaterThan(0);
  for (const bottle of bottles.data) {
    await page.goto(`/inventory/${bottle.id}`);
    await page.getByRole("button", { name: "Move…" }).click();
    const dialog = page.getByRole("dialog", { name: /^Move / });
    await dialog.getByLabel("Move to").selectOption({ label: "FSR-1 Flammable-storage refrigerator" });
    await dialog.getByRole("button", { name: "Move to 2.115 / FSR-1" }).click();
    await expect(page.getByText(/^Moved CV-\d+\.$/)).toBeVisible();
  }

  await page.goto(findingUrl);
  await expect(page.getByText("Resolved by re-assessment").first()).toBeVisible();
  await expect(page.getByText(/moved from .*FR-1.* to .*FSR-1/).first()).toBeVisible();

  // A whole location acknowledged in one step: the solvent store B-014's own findings.
  await page.goto("/register?view=locations");
  const store = page.getByRole("checkbox", { name: /^Select the \d+ findings in B-014$/ });
  const inStore = Number((await store.getAttribute("aria-label"))!.match(/\d+/)![0]);
  expect(inStore).toBeGreaterThan(1);
  await store.check();
  const actOn = page.getByRole("region", { name: "Act on the selected findings" });
  await expect(actOn.getByText(`${inStore} findings selected`)).toBeVisible();
  await actOn.getByLabel("Step").selectOption({ label: "Acknowledge" });
  await actOn.getByLabel("Note (optional)").fill("Walked through B-014 with facilities: ventilation running, spill kit in place.");
  await actOn.getByRole("button", { name: `Apply to ${inStore}` }).click();
  await expect(actOn.getByText(`${inStore} of ${inStore} findings acknowledged.`)).toBeVisible();
  const room = (await getJson<{ data: { id: number; code: string }[] }>(page, "/api/v1/rooms?q=B-014")).data.find((r) => r.code === "B-014")!;
  const stillOpen = await getJson<{ data: { storageUnitId: number | null }[] }>(page, `/api/v1/findings?roomId=${room.id}&status=open&pageSize=100`);
  expect(stillOpen.data.filter((f) => f.storageUnitId === null)).toEqual([]);

  // How long after a failure: ordered soonest first, the freezer FZ-1's methanol reaches its LFL
  // hours after the freezer fails, with the threshold and the warm-up drawn in the working.
  await page.goto("/register?view=lines&q=FZ-1");
  await page.getByRole("link", { name: "soonest after a failure" }).click();
  await expect(page).toHaveURL(/sort=timeToDanger/);
  await page.getByRole("link", { name: /^Methanol in FZ-1 could reach [\d,]+ % LFL if the freezer fails/ }).click();
  await expect(page.getByText("Time to danger", { exact: true })).toBeVisible();
  await expect(page.getByText(/^Reaches the LFL \(6\.\d °C\) this long after a failure\.$/)).toBeVisible();
  await expect(page.getByText(/Warm-up after a failure \(Newton's law of heating\)/).first()).toBeVisible();
  await new Shell(page).signOut();

  // The auditor's workbook.
  await signIn.signIn("auditor@example.org", DEMO_PASSWORD);
  await expect(page).toHaveURL(/\/$/);
  await page.goto("/exports");
  const downloading = page.waitForEvent("download");
  await page.getByRole("button", { name: "Download register workbook (.xlsx)" }).click();
  const download = await downloading;
  expect(download.suggestedFilename()).toMatch(/^headroom-register-\d{4}-\d{2}-\d{2}\.xlsx$/);
  const workbook = new ExcelJS.Workbook();
  await workbook.xlsx.readFile(await download.path());
  expect(workbook.worksheets.map((s) => s.name)).toEqual(["Summary", "Findings", "Finding traces", "Trace sources", "Inventory", "Locations", "Excursions", "Substances", "Methods and cautions"]);
  const sheet = workbook.getWorksheet("Findings")!;
  const headers = (sheet.getRow(1).values as unknown[]).slice(1);
  for (const header of ["Severity", "Status", "Rule", "Value", "Limit", "Value ÷ limit (%)", "Value unit", "Worst case (°C)", "Worst-case source"]) expect(headers).toContain(header);
  const col = (name: string) => headers.indexOf(name) + 1;
  // One finding's numbers against the API's.
  const api = await getJson<{ data: { id: number; value: number; limit: number; ratio: number; worstCaseTempC: number }[] }>(page, "/api/v1/findings?rule=enclosure-lfl&status=all&pageSize=1");
  const expected = api.data[0];
  let found = false;
  sheet.eachRow((row, n) => {
    if (n === 1 || row.getCell(col("Finding ID")).value !== expected.id) return;
    found = true;
    // Three significant figures, as the register shows them; the ratio with a percent format.
    const sf3 = (v: number) => Number(v.toPrecision(3));
    expect(row.getCell(col("Value")).value).toBe(sf3(expected.value));
    expect(row.getCell(col("Limit")).value).toBe(sf3(expected.limit));
    expect(row.getCell(col("Value ÷ limit (%)")).value).toBe(sf3(expected.ratio));
    expect(row.getCell(col("Value ÷ limit (%)")).numFmt).toBe("#,##0%");
    expect(row.getCell(col("Worst case (°C)")).value).toBeCloseTo(expected.worstCaseTempC, 6);
  });
  expect(found).toBe(true);
});
