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

  saveButton() {
    return this.page.getByRole("button", { name: "Log container" });
  }
}
