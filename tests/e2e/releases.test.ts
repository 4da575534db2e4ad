import { readFileSync } from "node:fs";
import type { Pool } from "pg";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { superuserPool } from "../integration/support/database";
import { appUrl, collectPageErrors, openBrowser, screenshot, seriousAccessibilityProblems } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";
import { ResultsPage } from "./support/results-pages";

let browser: BrowserContext;
let inspector: Pool;
let changedHarvest: string;

const latestRelease = async () => (await inspector.query<{ n: number }>("select max(number)::int as n from pooled_releases")).rows[0].n;

beforeAll(async () => {
  browser = await openBrowser();
  inspector = superuserPool();
});

afterAll(async () => {
  if (changedHarvest) {
    const { rows } = await inspector.query<{ farm_id: string }>(
      "update harvests set fresh_mass_g = fresh_mass_g - 50 where id = $1 returning farm_id",
      [changedHarvest],
    );
    await inspector.query("select pooled_refresh_farm($1)", [rows[0].farm_id]);
  }
  await browser?.close();
  await inspector?.end();
});

describe("releases of the pooled figures in the browser", () => {
  it("shows an observer which release the results come from, on the page and in the CSV", async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("observer@extension.example");
    await new AppShell(page).waitUntilSignedIn();
    await new ResultsPage(page).open();
    const release = await latestRelease();
    expect(await page.getByTestId("release-line").textContent()).toMatch(new RegExp(`Release ${release}, published \\d{4}-\\d{2}-\\d{2}`));
    const [download] = await Promise.all([
      page.waitForEvent("download"),
      page.getByRole("button", { name: "Download CSV" }).first().click(),
    ]);
    expect(download.suggestedFilename()).toBe(`co-op-strains-release-${release}.csv`);
    const [header, firstRow] = readFileSync(await download.path(), "utf8").split(/\r\n/);
    expect(header).toMatch(/,Release,Release published \(UTC\)$/);
    expect(firstRow).toMatch(new RegExp(`,${release},\\d{4}-\\d{2}-\\d{2} \\d{2}:\\d{2}$`));
    await screenshot(page, "results-release-line");
    expect(errors).toEqual([]);
    await page.close();
  });

  it("shows the coordinator why the next release waits and which count it needs, and publishes nothing", async () => {
    // One farm's harvest changes after the last release, as an upload of one farm would change it.
    const { rows } = await inspector.query<{ id: string; farm_id: string }>(
      `select h.id, h.farm_id from harvests h join farms f on f.id = h.farm_id where f.name = 'Hollow Oak Mushrooms' order by h.id limit 1`,
    );
    changedHarvest = rows[0].id;
    await inspector.query("update harvests set fresh_mass_g = fresh_mass_g + 50 where id = $1", [changedHarvest]);
    await inspector.query("select pooled_refresh_farm($1)", [rows[0].farm_id]);
    const before = await latestRelease();

    await browser.clearCookies();
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("coordinator@aldervalley.example");
    await new AppShell(page).waitUntilSignedIn();
    await page.goto(`${appUrl}/settings/cooperative`);
    const panel = page.getByTestId("release-panel");
    await panel.waitFor();
    expect(await panel.textContent()).toContain(`Members and observers see release ${before}`);
    expect(await panel.getByText("The next release waits").count()).toBe(1);
    expect(await page.getByTestId("waiting-figures").textContent()).toMatch(/changes from \d farms? so far; needs 3\./);
    await screenshot(page, "co-op-settings-release-waits");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);

    await page.getByRole("button", { name: "Publish a release now" }).click();
    await page.getByText("Nothing was published: the changes since the last release come from too few farms").waitFor();
    expect(await latestRelease()).toBe(before);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("refuses a minimum of 2 farms even when the form's own limit is taken off", async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    await new SignInPage(page).signIn("coordinator@aldervalley.example");
    await new AppShell(page).waitUntilSignedIn();
    await page.goto(`${appUrl}/settings/cooperative`);
    const field = page.getByLabel("Minimum number of farms behind a published figure");
    await field.evaluate((input: HTMLInputElement) => input.removeAttribute("min"));
    await field.fill("2");
    await page.getByRole("button", { name: "Save co-op settings" }).click();
    await page.getByText("At least 3 farms: with 2, each of the two farms would learn the other's figures").waitFor();
    expect((await inspector.query<{ minimum_farms: number }>("select minimum_farms from cooperative_settings")).rows[0].minimum_farms).toBe(
      3,
    );
    await screenshot(page, "co-op-settings-minimum-refused");
    await page.close();
  });
});
