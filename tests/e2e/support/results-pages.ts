import type { Page } from "playwright-core";
import { appUrl } from "./browser";

/** Each filter of the results form, by its label, and the name its select has in the form. */
const filters = {
  Species: "species",
  "Substrate recipe": "recipe",
  "Fruiting method": "method",
  "Flushes counted": "window",
  Season: "season",
} as const;
type Filter = keyof typeof filters;

/** The Co-op results page, as a member uses it. Every choice is a new address, rendered by the server. */
export class ResultsPage {
  constructor(readonly page: Page) {}

  async open(address = "/results"): Promise<void> {
    await this.page.goto(`${appUrl}${address}`);
    await this.waitForResults();
  }

  async waitForResults(): Promise<void> {
    await this.page.getByRole("table", { name: "Strains side by side" }).waitFor();
  }

  /** Picks an option of one of the filters and waits for the address, and with it the view, to change. */
  /** A filter's select (by name: a table's own search box may also have "season" in its label). */
  select(filter: Filter) {
    return this.page.getByRole("form", { name: "Choose what to compare" }).locator(`select[name=${filters[filter]}]`);
  }

  private async choose(filter: Filter, label: string): Promise<void> {
    const select = this.select(filter);
    const current = await select.evaluate((element) => (element as HTMLSelectElement).selectedOptions[0]?.textContent ?? "");
    if (current === label) return;
    const before = this.page.url();
    await select.selectOption({ label });
    await this.page.waitForURL((url) => url.toString() !== before);
    await this.waitForResults();
  }

  async chooseSpecies(name: RegExp): Promise<void> {
    const options = await this.select("Species").locator("option").allTextContents();
    const label = options.find((option) => name.test(option));
    if (!label) throw new Error(`no species matching ${name} in ${options.join(", ")}`);
    await this.choose("Species", label);
  }

  async chooseFlushes(label: string): Promise<void> {
    await this.choose("Flushes counted", label);
  }

  async chooseSeason(label: string): Promise<void> {
    await this.choose("Season", label);
  }

  /** The option each filter shows, by the filter's label. */
  async chosen(): Promise<Record<string, string>> {
    const chosen: Record<string, string> = {};
    for (const filter of Object.keys(filters) as Filter[]) {
      chosen[filter] = await this.select(filter).evaluate(
        (element) => (element as HTMLSelectElement).selectedOptions[0]?.textContent ?? "",
      );
    }
    return chosen;
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
