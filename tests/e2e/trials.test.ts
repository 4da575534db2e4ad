import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BrowserContext, Page } from "playwright-core";
import { mailsTo, mailTo } from "../support/mailbox";
import { appUrl, collectPageErrors, openBrowser, screenshot, seriousAccessibilityProblems } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";
import { TrialDesignPage, TrialPage } from "./support/trial-pages";

describe("a strain trial in the browser", () => {
  let browser: BrowserContext;
  let page: Page;
  let errors: string[];
  let trialId: string;
  let unsubscribeLink: string | undefined;

  beforeAll(async () => {
    browser = await openBrowser();
    page = await browser.newPage();
    errors = collectPageErrors(page);
  });
  afterAll(async () => {
    await browser?.close();
  });

  async function signInAs(email: string) {
    await new SignInPage(page).signIn(email);
    await new AppShell(page).waitUntilSignedIn();
  }

  it("lets the coordinator design a trial, watch the sample size change, and open enrolment", async () => {
    await signInAs("coordinator@aldervalley.example");
    const design = new TrialDesignPage(page);
    await design.open();
    await design.describe(
      "Grey Morning against Valley Wild",
      "Does PO-02 give a different BE over flushes 1–2 than PO-01?",
      "Oyster mushroom",
    );
    await design.chooseStrain(0, "PO-01 — Grey Morning");
    await design.chooseStrain(1, "PO-02 — Valley Wild");
    await design.setSpread("10");
    await design.setSmallestDifference("10");
    // delta = sd on 4 farms as blocks gives n = 16.82 (R; power.t.test's 16.71 less 3 error df) → 17.7 with 5 % loss → 5 per farm = 20.
    expect(await design.blocksPerArm(80)).toBe(20);
    await design.setSmallestDifference("5");
    const smaller = await design.blocksPerArm(80);
    expect(smaller).toBeGreaterThan(60);
    expect(await design.blocksPerArm(90)).toBeGreaterThan(smaller);
    await screenshot(page, "trials-design-sample-size");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await design.setSmallestDifference("10");

    trialId = await design.saveDraft();
    const trial = new TrialPage(page);
    expect(await trial.status()).toBe("Draft");
    await trial.move("Open for enrolment", "Open for enrolment");
    expect(await trial.status()).toBe("Open for enrolment");
    const invitationsBefore = (await mailsTo("manager@fernbrook.example", /^Invitation to trial/)).length;
    expect(await trial.invite("Fernbrook Farm", "Hollow Oak Mushrooms", "Mill Creek Fungi")).toContain("3 e-mails sent");
    // Before any farm accepts, the page says the trial cannot start yet, and why.
    expect(await trial.tooFewFarmsWarning()).toMatch(/0 of the 3 farms a trial needs have accepted/);
    await screenshot(page, "trials-open-for-enrolment");

    // The manager's inbox has the invitation with its unsubscribe link; the coordinator's Outgoing mail has its record only.
    const invitation = await mailTo("manager@fernbrook.example", /^Invitation to trial/, { count: invitationsBefore + 1, timeout: 30_000 });
    unsubscribeLink = invitation.text.match(/\/unsubscribe\/\S+/)?.[0];
    expect(unsubscribeLink).toBeTruthy();
    await page.goto(`${appUrl}/outgoing-mail`);
    await page.getByRole("table", { name: "Outgoing mail" }).getByText("Invitation to trial", { exact: false }).first().waitFor();
    expect(await page.content()).not.toContain(unsubscribeLink!);
    await screenshot(page, "trials-outgoing-mail");
    await new AppShell(page).signOut();
  });

  it("lets a farm manager accept, see the label sheet and download the list", async () => {
    await signInAs("manager@fernbrook.example");
    const trial = new TrialPage(page);
    await trial.open(trialId);
    await trial.accept(3);
    await screenshot(page, "trials-farm-enrolled");
    const response = await page.request.get(`${appUrl}/api/trials/${trialId}/list`);
    expect(response.status()).toBe(200);
    const csv = (await response.text()).trim().split(/\r\n/);
    // The list comes in the season-log upload format, one row per block, ready to fill in.
    const header = csv[0].split(",");
    expect(header.slice(0, 5)).toEqual(["block_id", "strain", "substrate", "trial", "arm"]);
    expect(header).toContain("fruiting_method");
    expect(csv).toHaveLength(1 + 6);
    const labels = await trial.openLabelSheet();
    expect(labels).toHaveLength(6);
    expect(labels.filter((label) => label.includes("Arm A"))).toHaveLength(3);
    await screenshot(page, "trials-label-sheet");
    await new AppShell(page).signOut();
  });

  it("refuses to start the trial with one farm, and says how many it needs", async () => {
    await signInAs("coordinator@aldervalley.example");
    const trial = new TrialPage(page);
    await trial.open(trialId);
    expect(await trial.tooFewFarmsWarning()).toMatch(/1 of the 3 farms a trial needs has accepted/);
    await page.getByRole("button", { name: "Start the trial" }).click();
    await page.getByText("Only 1 farm has accepted. A trial starts with at least 3 farms").waitFor();
    expect(await trial.status()).toBe("Open for enrolment");
    await screenshot(page, "trials-too-few-farms-to-start");
    await new AppShell(page).signOut();
  });

  it("lets two more farms accept", async () => {
    for (const email of ["manager@hollowoak.example", "manager@millcreek.example"]) {
      await signInAs(email);
      const trial = new TrialPage(page);
      await trial.open(trialId);
      await trial.accept(2);
      await new AppShell(page).signOut();
    }
  });

  it("lets the coordinator take the trial to publication", async () => {
    await signInAs("coordinator@aldervalley.example");
    const trial = new TrialPage(page);
    await trial.open(trialId);
    await page.getByTestId("progress-table").waitFor();
    expect(await trial.tooFewFarmsWarning()).toBeNull();
    await trial.move("Start the trial", "Running");
    // Before closing: what is incomplete per farm and arm (no block is in a season log yet), and a confirmation to tick.
    const review = await trial.closeReview();
    expect(review).toHaveLength(3 * 2);
    expect(review[0]).toMatch(/^Fernbrook FarmA30000 of 3$/);
    expect(await page.getByText("If the trial closed now, 0 blocks would be compared").isVisible()).toBe(true);
    await screenshot(page, "trials-close-review");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    const { untickedRefusal } = await trial.closeAfterReview();
    expect(untickedRefusal).not.toBe("");
    // Closed: no reminder can be sent any more.
    expect(await page.getByRole("button", { name: "Send a reminder" }).count()).toBe(0);
    await trial.move("Publish the results", "Published", true);
    expect(await trial.status()).toBe("Published");
    const history = await page.getByTestId("trial-history").textContent();
    expect(history).toContain("Collecting results → Published");
    // Every other event in words, as the activity log says it; never the log's internal names.
    expect(history).toMatch(/ran the analysis of trial \S+ \(run 1\)/);
    expect(history).not.toMatch(/analysed|farm_invited|enrolment_accepted/);
    await screenshot(page, "trials-published-by-coordinator");
    await new AppShell(page).signOut();
  });

  it("lets a member read a published trial's results", async () => {
    await signInAs("grower@fernbrook.example");
    await page.goto(`${appUrl}/trials`);
    const card = page.locator("li", { hasText: "Which oyster strain gives the most over two flushes?" });
    await card.getByRole("link", { name: "Read the results" }).click();
    await page.getByTestId("trial-answer").waitFor();
    expect(await page.getByTestId("trial-answer").textContent()).toMatch(/than the reference, .* \(arm A\)/);
    expect(await page.getByRole("img", { name: "Biological efficiency by arm, boxplot" }).isVisible()).toBe(true);
    expect(await page.getByRole("img", { name: /Arm B minus arm A, by farm/ }).isVisible()).toBe(true);
    // Deviations from the plan: every block left out, by reason and arm, beside the planned sample size.
    expect(await page.getByTestId("deviations-by-arm").isVisible()).toBe(true);
    expect(await page.getByTestId("planned-achieved").textContent()).toMatch(/^Planned: .*Achieved: \d+ farms? taking part/);
    // Fernbrook took part: its grower sees their own farm marked and, with per-farm estimates off, no other farm.
    expect(await page.locator("[data-forest-row=own]").count()).toBeGreaterThan(0);
    expect(await page.locator("[data-forest-row=farm]").count()).toBe(0);
    expect(await page.getByText(/Farm [A-Z]\b/).count()).toBe(0);
    await screenshot(page, "trials-results-member");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await page.setViewportSize({ width: 390, height: 844 });
    await screenshot(page, "trials-results-phone");
    expect(errors).toEqual([]);
  });

  it("stops a farm's reminders from the e-mail link without signing in", async () => {
    await page.setViewportSize({ width: 1280, height: 900 });
    await new AppShell(page).signOut();
    const signedOut = await browser.newPage();
    await signedOut.goto(`${appUrl}${unsubscribeLink}`);
    // Opening the link only asks (tests/e2e/unsubscribe.test.ts checks it changes nothing).
    await signedOut.getByRole("button", { name: "Stop reminders" }).click();
    await signedOut.getByRole("heading", { name: "Reminders stopped" }).waitFor();
    await screenshot(signedOut, "trials-unsubscribed");
    await signedOut.goto(`${appUrl}/unsubscribe/not-a-real-link`);
    await signedOut.getByRole("heading", { name: "This link does not work" }).waitFor();
    await signedOut.close();
  });
});
