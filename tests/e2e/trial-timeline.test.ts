import type { Pool } from "pg";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { todayUtc } from "@/lib/import/dates";
import { addDays } from "@/lib/trials/timeline";
import { superuserPool } from "../integration/support/database";
import { appUrl, collectPageErrors, openBrowser, screenshot, seriousAccessibilityProblems } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";
import { TrialDesignPage } from "./support/trial-pages";

// A running trial whose inoculation window has closed with no block in: every farm taking part is
// behind, which the trial page's timeline and the coordinator's Follow-up page must both say.

const today = todayUtc();
let inspector: Pool;
let browser: BrowserContext;
let page: Page;
let errors: string[];
let trialId: string;
const code = `T-TL-${Date.now().toString(36).toUpperCase()}`;

beforeAll(async () => {
  inspector = superuserPool();
  const { rows: strains } = await inspector.query<{ id: string; species_id: string }>(
    "select id, species_id from strains where code in ('PO-01', 'PO-02') order by code",
  );
  const { rows } = await inspector.query<{ id: string }>(
    `insert into trials (code, title, question, species_id, status, outcome_flushes, inoculation_from, inoculation_to, fruiting_from, fruiting_to, data_due)
     values ($1, 'Timeline trial of two oyster strains', 'Does PO-02 give more than PO-01?', $2, 'running', 2, $3, $4, $5, $6, $7) returning id`,
    [code, strains[0].species_id, addDays(today, -30), addDays(today, -10), addDays(today, -2), addDays(today, 40), addDays(today, 5)],
  );
  trialId = rows[0].id;
  for (const [index, strain] of strains.entries())
    await inspector.query("insert into trial_arms (trial_id, label, strain_id, is_reference, position) values ($1, $2, $3, $4, $5)", [
      trialId,
      ["A", "B"][index],
      strain.id,
      index === 0,
      index + 1,
    ]);
  await inspector.query(
    `insert into trial_enrolments (trial_id, farm_id, status, blocks_per_arm, responded_at)
     select $1, id, 'accepted', 3, now() from farms where name in ('Fernbrook Farm', 'Hollow Oak Mushrooms', 'Mill Creek Fungi')`,
    [trialId],
  );
  browser = await openBrowser();
  page = await browser.newPage();
  errors = collectPageErrors(page);
});

afterAll(async () => {
  await browser?.close();
  await inspector.query("delete from trials where id = $1", [trialId]);
  await inspector.end();
});

describe("a trial's timeline and the coordinator's follow-up", () => {
  it("lands the coordinator on Follow-up: what needs attention this week and each farm's data status", async () => {
    await new SignInPage(page).signIn("coordinator@aldervalley.example");
    await new AppShell(page).waitUntilSignedIn();
    await page.waitForURL(/\/coordinator$/);
    const attention = await page.getByTestId("attention").textContent();
    expect(attention).toContain(`${code} Fernbrook Farm is behind: 6 listed blocks are not in the season log`);
    expect(attention).toContain(`${addDays(today, 5)} ${code} The data are due`);
    const table = page.getByTestId(`farm-status-${code}`);
    expect(await table.getByRole("row").count()).toBe(1 + 3);
    expect(await table.getByRole("row", { name: /Hollow Oak Mushrooms/ }).textContent()).toMatch(/0 of 6/);
    expect(await page.getByRole("main").textContent()).not.toMatch(/\d+ ?g\b|BE \d/);
    await screenshot(page, "coordinator-follow-up");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
  });

  it("shows the trial's timeline as a bar and in words, and each farm's standing and last reminder", async () => {
    await page.goto(`${appUrl}/trials/${trialId}`);
    await page.getByTestId("trial-timeline").waitFor();
    const words = await page.getByTestId("trial-timeline-text").getByRole("listitem").allTextContents();
    expect(words).toEqual([
      `Inoculation: ${addDays(today, -30)} to ${addDays(today, -10)} (ended 10 days ago).`,
      `Fruiting expected: ${addDays(today, -2)} to ${addDays(today, 40)} (under way, ends in 40 days).`,
      `Data due: ${addDays(today, 5)} (in 5 days).`,
    ]);
    const progress = page.getByTestId("progress-table");
    expect(await progress.getByTestId("behind").allTextContents()).toEqual(["Behind", "Behind", "Behind"]);
    expect(await page.getByTestId("behind-why").getByRole("listitem").first().textContent()).toBe(
      `Fernbrook Farm: 6 listed blocks are not in the season log, and the inoculation window closed on ${addDays(today, -10)}`,
    );
    expect(await progress.getByTestId("last-reminded").allTextContents()).toEqual(["Never", "Never", "Never"]);
    await screenshot(page, "trial-timeline");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
  });

  it("refuses a timeline out of order on the design form, in plain words", async () => {
    const design = new TrialDesignPage(page);
    await design.open();
    await design.describe("Out of order", "Does PO-02 give a different BE than PO-01 over two flushes?", "Oyster mushroom");
    await design.chooseStrain(0, "PO-01 — Grey Morning");
    await design.chooseStrain(1, "PO-02 — Valley Wild");
    await page.getByLabel("Inoculation from").fill("2027-03-10");
    await page.getByLabel("Inoculation to").fill("2027-03-01");
    await page.getByLabel("Fruiting expected from").fill("2027-04-01");
    await page.getByLabel("Fruiting expected to").fill("2027-05-01");
    await page.getByLabel("Data due").fill("2027-03-20");
    await page.getByRole("button", { name: "Save draft" }).click();
    await page.getByText("The inoculation window ends (2027-03-01) before it starts (2027-03-10)").waitFor();
    await page.getByText("The data are due (2027-03-20) before fruiting starts (2027-04-01)").waitFor();
    await screenshot(page, "trial-timeline-refused");
    await new AppShell(page).signOut();
  });

  it("is the coordinator's alone", async () => {
    await new SignInPage(page).signIn("manager@fernbrook.example");
    await new AppShell(page).waitUntilSignedIn();
    expect(await new AppShell(page).menuLabels()).not.toContain("Follow-up");
    await page.goto(`${appUrl}/coordinator`);
    await page.waitForURL(/\/forbidden/);
    await page.goto(appUrl);
    await new AppShell(page).waitUntilSignedIn();
    await new AppShell(page).signOut();
    expect(errors).toEqual([]);
  });
});
