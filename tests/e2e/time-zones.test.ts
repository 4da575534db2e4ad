import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Pool } from "pg";
import type { BrowserContext, Page } from "playwright-core";
import { formatDateTime } from "@/lib/time/display";
import { appUrl, collectPageErrors, openBrowser, screenshot } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";
import { SeasonLogPage } from "./support/season-log-pages";
import { superuserPool } from "../integration/support/database";

// The server runs in UTC; the browser says it is in Berlin. Expected times come from
// lib/time/display.ts, whose offsets are the tz database's (checked in lib/time/display.test.ts).
const berlin = "Europe/Berlin";
const fileName = "hollowoak-times.csv";
const sheet = `Block;Strain;Substrate;Inoculated;Wet block (kg);Moisture;Flush;Harvested;Fresh weight (g)\r\nTZ-01;PO-01;HWB-20;02.03.2026;2,5;62 %;1;14.04.2026;600\r\n`;

async function sentCell(page: Page): Promise<string> {
  const row = page.getByRole("row", { name: new RegExp(fileName.replace(".", "\\.")) }).first();
  await row.waitFor();
  return ((await row.getByRole("cell").first().textContent()) ?? "").trim();
}

async function savePreferences(page: Page, choices: { zone?: string; dateStyle: string }): Promise<void> {
  await page.goto(`${appUrl}/settings`);
  const form = page.getByTestId("preferences");
  // The first choice is "this browser's time zone".
  await form.getByLabel("Show times in").selectOption(choices.zone ? { value: choices.zone } : { index: 0 });
  await form.getByLabel("Write dates as").selectOption({ label: choices.dateStyle });
  await form.getByRole("button", { name: "Save preferences" }).click();
  await form.getByRole("status").waitFor();
}

describe("a member in Berlin reads times in their zone and date style", () => {
  let browser: BrowserContext;
  beforeAll(async () => {
    browser = await openBrowser(undefined, berlin);
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("sees an upload's time in the browser's zone, then in the date style and zone chosen in Settings", async () => {
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("manager@hollowoak.example");
    await new AppShell(page).waitUntilSignedIn();

    const logs = new SeasonLogPage(page);
    await logs.open();
    const before = new Date();
    await logs.upload(fileName, sheet);
    const after = new Date();
    // The minute may turn between the two readings; the upload's time is one of them.
    const written = (dateStyle: "iso" | "day-month-year-dots", timeZone = berlin) => [
      ...new Set([before, after].map((instant) => formatDateTime(instant, { timeZone, dateStyle }))),
    ];

    // Nothing chosen yet: the browser's zone, in the ISO date style.
    await logs.open();
    expect(written("iso")).toContain(await sentCell(page));
    expect(await sentCell(page)).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2} CES?T$/);
    await screenshot(page, "time-zones-1-browser-zone");

    await savePreferences(page, { dateStyle: "21.03.2026" });
    expect(await page.getByTestId("preferences").getByLabel("Show times in").locator("option").first().textContent()).toContain(berlin);
    await screenshot(page, "time-zones-2-settings");
    await logs.open();
    expect(written("day-month-year-dots")).toContain(await sentCell(page));
    await screenshot(page, "time-zones-3-date-style");

    // A zone chosen in Settings wins over the browser's.
    await savePreferences(page, { zone: "America/New_York", dateStyle: "21.03.2026" });
    await logs.open();
    expect(written("day-month-year-dots", "America/New_York")).toContain(await sentCell(page));
    expect(await sentCell(page)).toMatch(/ GMT-[45]$/);
    await screenshot(page, "time-zones-4-chosen-zone");

    // Back as the demo had it, for the tests after this one.
    await savePreferences(page, { dateStyle: "2026-03-21" });
    expect(errors).toEqual([]);
    await page.close();
  });
});

describe("the coordinator in Berlin sets the hour releases are cut", () => {
  let browser: BrowserContext;
  let inspector: Pool;
  beforeAll(async () => {
    browser = await openBrowser(undefined, berlin);
    inspector = superuserPool();
  });
  afterAll(async () => {
    await inspector?.query("update cooperative_settings set release_hour = 2, release_time_zone = 'UTC'");
    await inspector?.end();
    await browser?.close();
  });

  it("on Berlin's clocks: the form shows the stored UTC hour as Berlin's, and saves the hour with the zone", async () => {
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("coordinator@aldervalley.example");
    await new AppShell(page).waitUntilSignedIn();
    await page.goto(`${appUrl}/settings/cooperative`);
    const hour = page.getByLabel(`At (hour, ${berlin})`);
    // The demo cuts at 02:00 UTC: 03:00 in Berlin in winter, 04:00 in summer (the tz database, read here through Intl).
    const next = new Date();
    next.setUTCHours(next.getUTCHours() >= 2 ? 26 : 2, 0, 0, 0);
    const berlinHour = Number(new Intl.DateTimeFormat("en-GB", { timeZone: berlin, hour: "2-digit", hourCycle: "h23" }).format(next));
    expect(Number(await hour.inputValue())).toBe(berlinHour);
    await hour.fill("5");
    await page.getByRole("button", { name: "Save co-op settings" }).click();
    await page.getByText("Saved. Co-op results use the new settings from now on.").waitFor();
    const { rows } = await inspector.query<{ release_hour: number; release_time_zone: string }>(
      "select release_hour, release_time_zone from cooperative_settings",
    );
    expect(rows[0]).toEqual({ release_hour: 5, release_time_zone: berlin });
    await page.reload();
    expect(await page.getByLabel(`At (hour, ${berlin})`).inputValue()).toBe("5");
    expect(await page.getByTestId("release-panel").textContent()).toMatch(/every night at 05:00 CES?T/);
    await screenshot(page, "time-zones-5-release-hour");
    expect(errors).toEqual([]);
    await page.close();
  });
});
