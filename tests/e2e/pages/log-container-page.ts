import { expect, type Page } from "@playwright/test";

/** "Log a container" (/inventory/new): the form and its "Before you save" what-if. */
export class LogContainerPage {
  constructor(private readonly page: Page) {}

  async goto() {
    await this.page.goto("/inventory/new");
    await expect(this.page.getByRole("heading", { name: "Log a container" })).toBeVisible();
  }

  async fillLabel(label: string) {
    await this.page.getByLabel("Label or barcode").fill(label);
  }

  /** Finds a substance by CAS number or name and picks it from the list. */
  async chooseSubstance(query: string, option: RegExp) {
    await this.page.getByRole("combobox", { name: "Substance" }).fill(query);
    await this.page.getByRole("option", { name: option }).click();
  }

  async setAmount(amount: string, unit: "mL" | "L" | "g" | "kg") {
    await this.page.getByLabel("Amount", { exact: true }).fill(amount);
    await this.page.getByLabel("Unit", { exact: true }).selectOption(unit);
  }

  async chooseStorageUnit(label: string) {
    await this.page.getByLabel("Storage unit").selectOption({ label });
  }

  /** The what-if panel beside the form. */
  whatIf() {
    return this.page.getByRole("region", { name: "Before you save" });
  }

  /** The what-if's "Safer places nearby" list. */
  saferPlaces() {
    return this.whatIf().getByTestId("safer-places");
  }

  /** Chooses a safer place in one click: it becomes the form's storage unit. */
  async choosePlace(unitCode: string, roomCode: string) {
    await this.saferPlaces().getByRole("button", { name: `Choose ${unitCode} in room ${roomCode}` }).click();
  }

  /** The storage unit the form has chosen, as its option reads. */
  chosenStorageUnit() {
    return this.page.getByLabel("Storage unit").locator("option:checked");
  }

  saveButton() {
    return this.page.getByRole("button", { name: "Log container" });
  }
}
