/**
 * Seasons in the browser: the coordinator sets the season start on Co-op settings (29 February is
 * refused beside the field), and a farm manager filters Blocks & harvests by season from the
 * address, so the filtered view can be bookmarked. Screenshots `seasons-*.png`.
 */
import type { Pool } from "pg";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { superuserPool } from "../integration/support/database";
import { appUrl, collectPageErrors, openBrowser, screenshot, seriousAccessibilityProblems } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";

let browser: BrowserContext;
let inspector: Pool;
let before: { month: number; day: number };

beforeAll(async () => {
  browser = await openBrowser();
  inspector = superuserPool();
  const { rows } = await inspector.query<{ month: number; day: number }>(
    "select season_start_month as month, season_start_day as day from cooperative_settings",
  );
  before = rows[0];
});

afterAll(async () => {
  if (before)
    await inspector.query("update cooperative_settings set season_start_month = $1, season_start_day = $2", [before.month, before.day]);
  await browser?.close();
  await inspector?.end();
});

describe("seasons in the browser", () => {
  it("lets the coordinator move the season start, and refuses 29 February beside the field", async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("coordinator@aldervalley.example");
    await new AppShell(page).waitUntilSignedIn();
    await page.goto(`${appUrl}/settings/cooperative`);
    const form = page.getByTestId("season-start");
    await form.waitFor();
    await form.getByLabel("Seasons start in").selectOption("2");
    await form.getByLabel("on day").fill("29");
    await form.getByRole("button", { name: "Save" }).click();
    await form.getByText(/cannot start on 29 February/).waitFor();
    await screenshot(page, "seasons-start-refused");

    await form.getByLabel("Seasons start in").selectOption("3");
    await form.getByLabel("on day").fill("1");
    await form.getByRole("button", { name: "Save" }).click();
    await form.getByText("Seasons now start on 1 March").waitFor();
    const { rows } = await inspector.query<{ month: number; day: number }>(
      "select season_start_month as month, season_start_day as day from cooperative_settings",
    );
    expect(rows[0]).toEqual({ month: 3, day: 1 });
    await screenshot(page, "seasons-start-saved");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("filters a farm's blocks by season from the address, so the view can be bookmarked", async () => {
    await inspector.query("update cooperative_settings set season_start_month = 3, season_start_day = 1");
    await browser.clearCookies();
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("manager@fernbrook.example");
    await new AppShell(page).waitUntilSignedIn();
    await page.goto(`${appUrl}/blocks`);
    const seasons = page.getByRole("navigation", { name: "Season", exact: true });
    await seasons.waitFor();
    const choice = seasons.getByRole("link").nth(1);
    const label = (await choice.textContent())!.trim();
    expect(label).toMatch(/^\d{4}\/\d{2}$/);
    await choice.click();
    await page.waitForURL(/\/blocks\?season=\d{4}$/);
    const bookmarked = page.url();
    await page.getByRole("table").first().waitFor();
    // The Season column wherever it stands (a phone shows it one tap away; the browser here is wide).
    const headers = (await page.locator("thead th").allTextContents()).map((text) => text.replace(/[▲▼↕]/g, "").trim());
    const seasonCells = await page.locator(`tbody tr td:nth-child(${headers.indexOf("Season") + 1})`).allTextContents();
    expect(seasonCells.length).toBeGreaterThan(0);
    expect(new Set(seasonCells.map((text) => text.trim()))).toEqual(new Set([label]));
    await screenshot(page, "seasons-blocks-filtered");

    await page.goto(bookmarked);
    expect(await seasons.getByRole("link", { name: label }).getAttribute("aria-current")).toBe("page");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    expect(errors).toEqual([]);
    await page.close();
  });
});
