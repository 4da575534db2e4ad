import type { Page } from "playwright-core";
import { appUrl } from "./browser";

/** The Co-op results page, as a member uses it. */
export class ResultsPage {
  constructor(readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.goto(`${appUrl}/results`);
    await this.waitForResults();
  }

  async waitForResults(): Promise<void> {
    await this.page.getByRole("table", { name: "Strains side by side" }).waitFor();
  }

  async chooseSpecies(name: RegExp): Promise<void> {
    const select = this.page.getByLabel("Species");
    const options = await select.locator("option").allTextContents();
    const label = options.find((option) => name.test(option));
    if (!label) throw new Error(`no species matching ${name} in ${options.join(", ")}`);
    await Promise.all([this.page.waitForResponse((response) => response.url().includes("/api/results")), select.selectOption({ label })]);
    await this.waitForResults();
  }

  async chooseFlushes(label: string): Promise<void> {
    await Promise.all([
      this.page.waitForResponse((response) => response.url().includes("window=")),
      this.page.getByLabel("Flushes counted").selectOption({ label }),
    ]);
    await this.waitForResults();
  }

  async strainNames(): Promise<string[]> {
    const cells = this.page.getByRole("table", { name: "Strains side by side" }).locator("tbody tr td:first-child");
    return (await cells.allTextContents()).map((text) => text.trim());
  }

  /** Dots drawn for the viewer's own blocks on the boxplot. */
  async ownBlockDots(): Promise<number> {
    await this.page.locator("svg[role=img]").first().waitFor();
    return this.page.locator("[data-testid=own-blocks] circle").count();
  }

  async forestRows(kind: "own" | "farm" | "pooled"): Promise<number> {
    return this.page.locator(`[data-forest-row=${kind}]`).count();
  }
}
