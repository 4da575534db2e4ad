import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BrowserContext, Page } from "playwright-core";
import { collectPageErrors, openBrowser, screenshot, seriousAccessibilityProblems } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";
import { TrialDesignPage, TrialPage } from "./support/trial-pages";

// The coordinator designs a trial whose unit is the room: each arm a climate regime, rooms drawn to
// the arms within each farm, and the size in rooms from the design effect 1 + (m − 1)·ICC.
describe("a room-level trial, in the browser", () => {
  let browser: BrowserContext;
  let page: Page;
  let errors: string[];
  let trialId: string;

  beforeAll(async () => {
    browser = await openBrowser();
    page = await browser.newPage();
    errors = collectPageErrors(page);
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("sizes the trial in rooms, follows the blocks per room and the ICC, and saves the draft", async () => {
    await new SignInPage(page).signIn("coordinator@aldervalley.example");
    await new AppShell(page).waitUntilSignedIn();
    const design = new TrialDesignPage(page);
    await design.open();
    await design.describe(
      "Misted all day or soaked once a day",
      "Do rooms soaked once a day give less mould than rooms misted all day, at the same BE?",
      "Oyster mushroom",
    );
    await page.getByLabel(/^Rooms randomised to climate regimes/).check();
    await design.chooseStrain(0, "PO-01 — Grey Morning");
    await design.chooseStrain(1, "PO-01 — Grey Morning");
    // The regime list holds climate regimes only, and each arm needs its own.
    await page.locator("#arm-0-treatment").selectOption({ label: "Misted all day" });
    expect(await page.getByTestId("room-arm-problems").textContent()).toMatch(/Arm B: pick the climate regime/);
    await page.locator("#arm-1-treatment").selectOption({ label: "Soaked once a day" });
    expect(await page.getByTestId("room-arm-problems").count()).toBe(0);

    await design.setSmallestDifference("8");
    await design.setSpread("12");
    await page.getByLabel("Farms you plan to enrol").fill("4");
    await page.getByLabel("Blocks expected to be lost (%)").fill("5");
    await page.getByLabel("Blocks each room holds").fill("6");
    await page.getByLabel(/^How alike blocks in one room are/).fill("0.05");
    // lib/stats/room-trials.test.ts (R 4.2.2): 8.69 rooms per arm for 80 % power; over 4 farms after a 5 % loss, 3 rooms each.
    expect(await page.getByTestId("design-effect").textContent()).toBe("1.25");
    const rooms = page.getByTestId("room-power-80").getByTestId("rooms-per-arm");
    expect(await rooms.textContent()).toBe("12");
    // Blocks in a room more alike: more rooms.
    await page.getByLabel(/^How alike blocks in one room are/).fill("0.3");
    await page.getByTestId("design-effect").filter({ hasText: "2.50" }).waitFor();
    expect(Number(await rooms.textContent())).toBeGreaterThan(12);
    await page.getByLabel(/^How alike blocks in one room are/).fill("0.05");
    await page.getByTestId("design-effect").filter({ hasText: "1.25" }).waitFor();
    await screenshot(page, "room-trial-design");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);

    trialId = await design.saveDraft();
    expect(await page.getByTestId("design-kind-summary").textContent()).toMatch(
      /^Rooms randomised to climate regimes within each farm, 6 blocks a room, sized for an intraclass correlation of 0.05/,
    );
    await screenshot(page, "room-trial-draft");
    const trial = new TrialPage(page);
    await trial.move("Open for enrolment", "Open for enrolment");
    expect(await trial.invite("Fernbrook Farm")).toContain("e-mail");
    await new AppShell(page).signOut();
    expect(errors).toEqual([]);
  });

  it("lets a farm pick its own rooms, draws them to the arms and says which regime each room runs", async () => {
    await new SignInPage(page).signIn("manager@fernbrook.example");
    await new AppShell(page).waitUntilSignedIn();
    const trial = new TrialPage(page);
    await trial.open(trialId);
    // Fernbrook's demo rooms (db/seed-rooms.ts): a tub and a tent, one for each of the two arms.
    await page.getByRole("checkbox", { name: "Tub 1" }).check();
    await page.getByRole("checkbox", { name: "Back tent" }).check();
    await screenshot(page, "room-trial-pick-rooms");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await page.getByRole("button", { name: "Accept and draw our rooms" }).click();
    const draw = page.getByTestId("room-draw");
    await draw.waitFor();
    const rows = await draw.locator("tbody tr").allTextContents();
    expect(rows).toHaveLength(2);
    expect(rows.join(" ")).toMatch(/Tub 1/);
    expect(rows.join(" ")).toMatch(/Back tent/);
    // One room to each arm, each with its arm's regime.
    expect(rows.some((row) => /A \(Grey Morning\)Misted all day/.test(row))).toBe(true);
    expect(rows.some((row) => /B \(Grey Morning\)Soaked once a day/.test(row))).toBe(true);
    expect(await draw.textContent()).toMatch(/Run each room under its arm's climate regime/);
    expect(await draw.getByText("Humidifiers and mains power").count()).toBeGreaterThan(0);
    await screenshot(page, "room-trial-rooms-drawn");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    expect(errors).toEqual([]);
  });
});
