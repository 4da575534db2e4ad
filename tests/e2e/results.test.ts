import type { Pool } from "pg";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { superuserPool } from "../integration/support/database";
import { appUrl, collectPageErrors, openBrowser, screenshot, seriousAccessibilityProblems } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";
import { ResultsPage } from "./support/results-pages";

let browser: BrowserContext;
let inspector: Pool;
let farmNames: string[];

beforeAll(async () => {
  browser = await openBrowser();
  inspector = superuserPool();
  farmNames = (await inspector.query<{ name: string }>("select name from farms")).rows.map((row) => row.name);
});

afterAll(async () => {
  await browser?.close();
  await inspector?.query("update cooperative_settings set show_per_farm_estimates = false");
  await inspector?.end();
});

describe("Co-op results in the browser", () => {
  it("lets a farm manager switch species and flushes, and see their own blocks and farm on the charts", async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("manager@fernbrook.example");
    await new AppShell(page).waitUntilSignedIn();
    const results = new ResultsPage(page);
    await results.open();
    await results.chooseSpecies(/oyster/i);
    expect(await results.strainNames()).toEqual(expect.arrayContaining(["Grey Morning", "Slate Blue", "Valley Wild"]));

    await results.chooseSpecies(/lion/i);
    expect(await results.strainNames()).toEqual(expect.arrayContaining(["Snowdrift", "Beech Hollow"]));
    await results.chooseFlushes("Flushes 1–2");
    expect(await results.ownBlockDots()).toBeGreaterThan(0);
    expect(await results.forestRows("own")).toBeGreaterThan(0);
    expect(await results.forestRows("pooled")).toBeGreaterThan(0);
    // Per-farm estimates are off by default: no other farm appears, named or not.
    expect(await results.forestRows("farm")).toBe(0);
    expect(await page.getByText("Strain", { exact: false }).first().isVisible()).toBe(true);
    expect(await page.getByText("What a pooled figure means").isVisible()).toBe(true);
    await screenshot(page, "results-farm-manager-lions-mane-flushes-1-2");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    const text = await page.locator("main").textContent();
    for (const name of farmNames.filter((name) => name !== "Fernbrook Farm")) expect(text).not.toContain(name);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("shows an observer pooled results and no farm-level data", async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("observer@extension.example");
    await new AppShell(page).waitUntilSignedIn();
    const results = new ResultsPage(page);
    await results.open();
    expect(await page.getByRole("table", { name: "Strains side by side" }).locator("tbody tr").count()).toBeGreaterThan(0);
    expect(await results.ownBlockDots()).toBe(0);
    expect(await results.forestRows("own")).toBe(0);
    expect(await results.forestRows("farm")).toBe(0);
    expect(await results.forestRows("pooled")).toBeGreaterThan(0);
    const text = await page.locator("main").textContent();
    for (const name of farmNames) expect(text).not.toContain(name);
    await screenshot(page, "results-observer");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("reopens a bookmarked view with every filter as it was, steps back through filter changes, and filters by season", async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("observer@extension.example");
    await new AppShell(page).waitUntilSignedIn();
    const results = new ResultsPage(page);
    await results.open();
    await results.chooseSpecies(/lion/i);
    await results.chooseFlushes("Flushes 1–2");
    const bookmark = new URL(page.url());
    expect(bookmark.searchParams.get("window")).toBe("1-2");
    expect(bookmark.searchParams.get("species")).toMatch(/^[0-9a-f-]{36}$/);
    const view = { chosen: await results.chosen(), strains: await results.strainNames() };
    expect(view.chosen["Species"]).toMatch(/lion/i);

    // The bookmark, opened afresh in another tab, shows the same view.
    const again = await browser.newPage();
    const reopened = new ResultsPage(again);
    await reopened.open(`${bookmark.pathname}${bookmark.search}`);
    expect({ chosen: await reopened.chosen(), strains: await reopened.strainNames() }).toEqual(view);
    await again.close();

    // The back button undoes the last change only.
    await page.goBack();
    await page.waitForURL((url) => !url.searchParams.has("window"));
    await results.waitForResults();
    expect(await results.chosen()).toMatchObject({ Species: view.chosen["Species"], "Flushes counted": "All flushes" });

    // BE season by season, then one season: the address keeps it and the page leads with that season.
    await page.getByRole("table", { name: "BE season by season" }).waitFor();
    const seasons = await results.select("Season").locator("option").allTextContents();
    expect(seasons[0]).toBe("All seasons");
    expect(seasons.length).toBeGreaterThan(1);
    await results.chooseSeason(seasons[1]);
    expect(new URL(page.url()).searchParams.get("season")).toMatch(/^\d{4}$/);
    const seasonTable = page.getByRole("table", { name: `BE in season ${seasons[1]}` });
    await seasonTable.waitFor();
    expect(await seasonTable.locator("tbody tr").count()).toBeGreaterThan(0);
    expect(await seasonTable.textContent()).toMatch(/\d+\.\d % \(/);
    await screenshot(page, "results-observer-one-season");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("says what is wrong with an address that names no view, instead of an error page", async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    await new SignInPage(page).signIn("observer@extension.example");
    await new AppShell(page).waitUntilSignedIn();
    await page.goto(`${appUrl}/results?window=7&season=spring&species=00000000-0000-4000-8000-000000000000`);
    const alert = page.getByRole("alert").filter({ hasText: "This address does not name a view of the results" });
    await alert.waitFor();
    expect(await alert.textContent()).toMatch(/flushes counted in the address must be all, 1-2 or 1/);
    expect(await alert.textContent()).toMatch(/"spring", is not a season/);
    await page.goto(`${appUrl}/results?species=00000000-0000-4000-8000-000000000000`);
    await page.getByText("That species is not in the co-op's list").waitFor();
    await page.getByRole("link", { name: "Open the results without filters" }).click();
    await new ResultsPage(page).waitForResults();
    await screenshot(page, "results-address-refused-then-opened");
    await page.close();
  });

  it("lets the coordinator raise the minimum and show anonymised farms, and the results follow", async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    await new SignInPage(page).signIn("coordinator@aldervalley.example");
    await new AppShell(page).waitUntilSignedIn();
    await page.goto(`${appUrl}/settings/cooperative`);
    await page.getByLabel("Minimum number of farms behind a published figure").fill("6");
    await page.getByLabel("Show anonymised per-farm estimates").check();
    await page.getByRole("button", { name: "Save co-op settings" }).click();
    await page.getByText("Saved.").waitFor();
    await screenshot(page, "co-op-settings-saved");

    const results = new ResultsPage(page);
    await results.open();
    expect(await page.getByText("fewer than 6 farms").count()).toBeGreaterThan(0);
    expect(await page.getByText("Not enough data").count()).toBeGreaterThan(0);
    await screenshot(page, "results-suppressed-below-minimum");

    await page.goto(`${appUrl}/settings/cooperative`);
    await page.getByLabel("Minimum number of farms behind a published figure").fill("3");
    await page.getByRole("button", { name: "Save co-op settings" }).click();
    await page.getByText("Saved.").waitFor();
    await results.open();
    expect(await results.forestRows("farm")).toBeGreaterThan(0);
    await screenshot(page, "results-coordinator-anonymised-farms");
    await page.close();
  });

  it("shows a farm manager My farm with the co-op beside it", async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("manager@hollowoak.example");
    await new AppShell(page).waitUntilSignedIn();
    await page.goto(`${appUrl}/my-farm`);
    const table = page.getByRole("table", { name: "Your season by strain" });
    await table.waitFor();
    expect(await table.locator("tbody tr").count()).toBeGreaterThan(0);
    // Hollow Oak records in pounds; the member's display preference (metric) decides what is shown.
    expect(await table.textContent()).toMatch(/kg|g/);
    expect(await page.getByText("above").count()).toBeGreaterThan(0);
    await screenshot(page, "my-farm-hollow-oak");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    expect(errors).toEqual([]);
    await page.close();
  });
});
