import type { Page } from "playwright-core";
import { appUrl } from "./browser";

/** The Season logs page: choose a file, fix the mapping, review, commit. */
export class SeasonLogPage {
  constructor(readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.goto(`${appUrl}/season-logs`);
    await this.page.getByRole("heading", { name: "Season logs", level: 1 }).waitFor();
  }

  async upload(name: string, text: string): Promise<void> {
    await this.page.locator("#season-log-file").setInputFiles({ name, mimeType: "text/csv", buffer: Buffer.from(text, "utf8") });
    await this.page.getByTestId("review-summary").waitFor();
  }

  /** Sends a file as it is on disk (a spreadsheet program's workbook). */
  async uploadFile(name: string, bytes: Buffer, mimeType: string): Promise<void> {
    await this.page.locator("#season-log-file").setInputFiles({ name, mimeType, buffer: bytes });
    await this.page.getByTestId("review-summary").waitFor();
  }

  async chooseSheet(name: string): Promise<void> {
    await this.page.getByLabel("Which sheet holds the season log?").selectOption({ label: name });
  }

  async mapColumn(header: string, targetLabel: string): Promise<void> {
    await this.page.getByLabel(`Column “${header}”`, { exact: false }).selectOption({ label: targetLabel });
  }

  async checkAgain(): Promise<void> {
    const summary = await this.summary();
    await this.page.getByRole("button", { name: "Check the file again with these choices" }).click();
    await this.page.waitForFunction((before) => document.querySelector("[data-testid=review-summary]")?.textContent !== before, summary);
  }

  async summary(): Promise<string> {
    return ((await this.page.getByTestId("review-summary").textContent()) ?? "").replace(/\s+/g, " ").trim();
  }

  /** The problems in the table by their stable codes (never by wording), with the value as written. */
  async issues(): Promise<{ code: string; value: string }[]> {
    const table = this.page.getByRole("table", { name: "Problems found in the file" });
    if ((await table.count()) === 0) return [];
    return table.locator("tbody tr").evaluateAll((rows) =>
      rows
        .map((row) => ({
          code: row.querySelector("[data-issue-code]")?.getAttribute("data-issue-code") ?? "",
          value: (row.querySelectorAll("td")[3]?.textContent ?? "").trim(),
        }))
        .filter((issue) => issue.code !== ""),
    );
  }

  commitButton() {
    return this.page.getByRole("button", { name: "Commit to my farm's records" });
  }

  async previewCounts(): Promise<string> {
    return ((await this.page.getByTestId("preview-counts").textContent()) ?? "").replace(/\s+/g, " ");
  }

  /** The review's table of each block's fruiting room, as one line of text. */
  async previewRooms(): Promise<string> {
    return ((await this.page.getByTestId("preview-rooms").textContent()) ?? "").replace(/\s+/g, " ");
  }

  async startOver(): Promise<void> {
    await this.page.getByRole("button", { name: "Upload a corrected file" }).click();
    await this.page.locator("#season-log-file").waitFor({ state: "attached" });
  }

  async commit(): Promise<string> {
    await this.commitButton().click();
    const receipt = this.page.getByTestId("receipt");
    await receipt.waitFor();
    return ((await receipt.textContent()) ?? "").replace(/\s+/g, " ");
  }
}

/** Blocks & harvests: the farm's table. */
export class BlocksPage {
  constructor(readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.goto(`${appUrl}/blocks`);
    await this.page.getByRole("heading", { name: "Blocks & harvests", level: 1 }).waitFor();
  }

  /** Searches by block code or note on the server: the search lands in the address (?q=). */
  async search(text: string): Promise<void> {
    const form = this.page.getByRole("search", { name: "Search blocks" });
    await form.getByLabel("Block code or note").fill(text);
    await Promise.all([this.page.waitForURL(/[?&]q=/), form.getByRole("button", { name: "Search" }).click()]);
    await this.page
      .getByRole("status")
      .filter({ hasText: "in the code or the note" })
      .or(this.page.getByText(/in its code or note/))
      .first()
      .waitFor();
  }

  /** Block codes in the visible rows (the links in the first column; a phone shows the state under each). */
  async blockCodes(): Promise<string[]> {
    const table = this.page.getByRole("table", { name: "Blocks and harvests" });
    return (await table.locator("tbody tr td:first-child a").allTextContents()).map((text) => text.trim());
  }
}

/** The quick harvest form. */
export class QuickHarvestPage {
  constructor(readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.goto(`${appUrl}/blocks/harvest`);
    await this.page.getByRole("heading", { name: "Record a harvest" }).waitFor();
  }

  async suggestedFlushFor(blockCode: string): Promise<string> {
    await this.page.getByLabel("Block code").fill(blockCode);
    return this.page.getByLabel("Flush").inputValue();
  }

  async record(weight: string, unit: string): Promise<string> {
    await this.fill(weight, unit);
    await this.page.getByRole("button", { name: "Save this flush" }).click();
    return this.savedMessage();
  }

  /** Sends an entry the import's rules question; returns the warnings shown under its fields. */
  async recordQuestioned(flush: string, weight: string, unit: string): Promise<string> {
    await this.page.getByLabel("Flush").fill(flush);
    await this.fill(weight, unit);
    await this.page.getByRole("button", { name: "Save this flush" }).click();
    await this.page.getByRole("button", { name: "Save anyway" }).waitFor();
    return (await this.page.locator("[data-testid$='-warnings']").allTextContents()).join(" ");
  }

  async saveAnyway(): Promise<string> {
    await this.page.getByRole("button", { name: "Save anyway" }).click();
    return this.savedMessage();
  }

  /** Waits until the unit picker shows `unit` (what the phone remembers is applied after hydration); false after 5 s. */
  async showsUnit(unit: string): Promise<boolean> {
    try {
      await this.page.waitForFunction(
        (expected) => (document.getElementById("unit") as HTMLSelectElement | null)?.value === expected,
        unit,
        {
          timeout: 5_000,
        },
      );
      return true;
    } catch {
      return false;
    }
  }

  async weightKeypad(): Promise<string | null> {
    return this.page.getByLabel("Fresh weight").getAttribute("inputmode");
  }

  private async fill(weight: string, unit: string): Promise<void> {
    await this.page.getByLabel("Fresh weight").fill(weight);
    await this.page.getByLabel("Unit").selectOption(unit);
  }

  private async savedMessage(): Promise<string> {
    const saved = this.page.getByRole("status").filter({ hasText: "Saved flush" });
    await saved.waitFor();
    return (await saved.textContent()) ?? "";
  }
}
