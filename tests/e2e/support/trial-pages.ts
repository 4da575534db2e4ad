import type { Page } from "playwright-core";
import { appUrl } from "./browser";

/** The coordinator's design form with its live sample-size panel. */
export class TrialDesignPage {
  constructor(readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.goto(`${appUrl}/trials`);
    await this.page.getByRole("link", { name: "Design a trial" }).click();
    await this.page.getByRole("heading", { name: "Design a trial" }).waitFor();
  }

  async describe(title: string, question: string, species: string): Promise<void> {
    await this.page.getByLabel("Title").fill(title);
    await this.page.getByLabel("The question, in one sentence").fill(question);
    await this.page.getByLabel("Species").selectOption({ label: species });
  }

  async chooseStrain(armIndex: number, strainLabel: string): Promise<void> {
    await this.page.locator(`#arm-${armIndex}-strain`).selectOption({ label: strainLabel });
  }

  async setSmallestDifference(value: string): Promise<void> {
    await this.page.getByLabel("Smallest difference worth finding (BE points)").fill(value);
  }

  async setSpread(value: string): Promise<void> {
    await this.page.getByLabel("Expected spread between blocks (SD, BE points)").fill(value);
  }

  /** Blocks per arm to make at the given power (80 or 90), as the panel shows it now. */
  async blocksPerArm(power: 80 | 90): Promise<number> {
    const cell = this.page.getByTestId(`power-${power}`).getByTestId("per-arm");
    return Number(await cell.textContent());
  }

  async saveDraft(): Promise<string> {
    await this.page.getByRole("button", { name: "Save draft" }).click();
    await this.page.waitForURL(/\/trials\/[0-9a-f-]{36}$/);
    return this.page.url().split("/").pop()!;
  }
}

/** A trial's own page: moves, invitations, the farm's answer and list. */
export class TrialPage {
  constructor(readonly page: Page) {}

  async open(trialId: string): Promise<void> {
    await this.page.goto(`${appUrl}/trials/${trialId}`);
  }

  /** Presses a move button and waits until the trial shows its new state. */
  async move(label: string, expectedStatus: string, asksToConfirm = false): Promise<void> {
    if (asksToConfirm) this.page.once("dialog", (dialog) => void dialog.accept());
    await this.page.getByRole("button", { name: label }).click();
    await this.page.getByTestId("trial-status").filter({ hasText: expectedStatus }).waitFor();
  }

  /** The close step: the counts of what is still incomplete, per farm and arm, as the review table shows them. */
  async closeReview(): Promise<string[]> {
    const table = this.page.getByTestId("close-review");
    await table.waitFor();
    return table.locator("tbody tr").allTextContents();
  }

  /** Closes the trial: unticked, the browser holds the form back and says why; ticked, the trial moves to Collecting results. */
  async closeAfterReview(): Promise<{ untickedRefusal: string }> {
    const button = this.page.getByRole("button", { name: "Close and analyse" });
    const confirmation = this.page.getByLabel(/I have read what is still incomplete/);
    await button.click();
    const untickedRefusal = await confirmation.evaluate((input: HTMLInputElement) => input.validationMessage);
    await confirmation.check();
    await button.click();
    await this.page.getByTestId("trial-status").filter({ hasText: "Collecting results" }).waitFor();
    return { untickedRefusal };
  }

  async status(): Promise<string> {
    return (await this.page.getByTestId("trial-status").first().textContent())?.trim() ?? "";
  }

  async invite(...farmNames: string[]): Promise<string> {
    for (const farmName of farmNames) await this.page.getByLabel(farmName).check();
    await this.page.getByRole("button", { name: "Invite and e-mail their managers" }).click();
    const status = this.page.getByRole("status").filter({ hasText: "Invited" });
    await status.waitFor();
    return (await status.textContent()) ?? "";
  }

  /** The coordinator's warning that too few farms have accepted to start, or null when there is none. */
  async tooFewFarmsWarning(): Promise<string | null> {
    const warning = this.page.getByTestId("too-few-farms");
    return (await warning.count()) ? await warning.textContent() : null;
  }

  async accept(blocksPerArm: number): Promise<void> {
    await this.page.getByLabel("Blocks per arm").fill(String(blocksPerArm));
    await this.page.getByRole("button", { name: "Accept and make our list" }).click();
    await this.page.getByRole("heading", { name: "Your farm's part" }).waitFor();
  }

  async openLabelSheet(): Promise<string[]> {
    await this.page.getByRole("link", { name: "Label sheet" }).click();
    await this.page.getByTestId("label-sheet").waitFor();
    return this.page.getByTestId("label-sheet").locator(".label").allTextContents();
  }
}
