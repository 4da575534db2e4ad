import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BrowserContext, Page } from "playwright-core";
import { collectPageErrors, openBrowser, screenshot, seriousAccessibilityProblems } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";
import { TrialDesignPage } from "./support/trial-pages";

// The coordinator declares a trial's arms as two strains crossed with two fruiting methods: the
// form makes one arm per combination, says what an incomplete crossing lacks, and saves it.
describe("a trial crossing strains with fruiting methods, in the browser", () => {
  let browser: BrowserContext;
  let page: Page;
  let errors: string[];

  beforeAll(async () => {
    browser = await openBrowser();
    page = await browser.newPage();
    errors = collectPageErrors(page);
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("makes one arm per strain and method, refuses half a crossing, and saves the whole one", async () => {
    await new SignInPage(page).signIn("coordinator@aldervalley.example");
    await new AppShell(page).waitUntilSignedIn();
    const design = new TrialDesignPage(page);
    await design.open();
    await design.describe(
      "Slits or an opened top, for two oyster strains",
      "Do slits across the bag give more BE than an opened top, and does it depend on the strain?",
      "Oyster mushroom",
    );
    await page.getByLabel(/^Strains crossed with fruiting methods/).check();
    await page.getByLabel("PO-01 — Grey Morning").check();
    await page.getByLabel("PO-02 — Valley Wild").check();
    await page.getByLabel("Slits cut across the bag").check();
    // One method only: the form says what is missing, and the server refuses it in the same words.
    expect(await page.getByTestId("crossing-problems").textContent()).toBe("Give the fruiting method at least two levels to compare.");
    await page.getByRole("button", { name: "Save draft" }).click();
    await page.locator("#design-message").filter({ hasText: "Give the fruiting method at least two levels to compare." }).waitFor();
    expect(page.url()).toMatch(/\/trials\/new$/);
    // What the coordinator typed is still there after the refusal.
    expect(await page.getByLabel("Title").inputValue()).toBe("Slits or an opened top, for two oyster strains");

    await page.getByLabel("Bag opened at the top").check();
    const arms = page.getByTestId("crossed-arms").locator("tbody tr");
    expect(await arms.allTextContents()).toEqual([
      "APO-01 — Grey MorningSlits cut across the bag",
      "BPO-01 — Grey MorningBag opened at the top",
      "CPO-02 — Valley WildSlits cut across the bag",
      "DPO-02 — Valley WildBag opened at the top",
    ]);
    expect(await page.getByTestId("crossing-problems").count()).toBe(0);
    // Sized for comparing the two methods within one strain, with what the comparison over both strains needs beside it.
    const panel = await page.getByTestId("sample-size-panel").textContent();
    expect(panel).toMatch(/two fruiting methods can be told apart within one strain/);
    expect(panel).toMatch(/averaged over the strains, which needs only \d+\.\d blocks per arm/);
    await screenshot(page, "trials-crossed-design");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);

    await design.saveDraft();
    expect(await page.getByTestId("design-kind-summary").textContent()).toMatch(/^Strains crossed with fruiting methods/);
    await screenshot(page, "trials-crossed-draft");
    expect(errors).toEqual([]);
  });
});
