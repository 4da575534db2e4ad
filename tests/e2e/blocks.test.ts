/**
 * Blocks & harvests on a phone and on a laptop, and a block's page. At 390 px the columns a grower
 * looks for first (block, strain, BE, state, last flush) show and the others are one tap away; at
 * 1366 px every column shows. A search by a word of a block's note finds it, from the address. The
 * block's flushes are drawn over time beside the co-op's curve for its strain, with the Content
 * Security Policy enforced (a style attribute in the server's HTML would be a console error).
 * Screenshots `blocks-*.png`.
 */
import type { Pool } from "pg";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { superuserPool } from "../integration/support/database";
import { appUrl, collectPageErrors, openBrowser, pageLayoutProblems, screenshot } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";
import { BlocksPage } from "./support/season-log-pages";

let phone: BrowserContext;
let laptop: BrowserContext;
let inspector: Pool;
let block: { id: string; code: string };
const note = `tray 4 by the humidifier ${Date.now().toString(36)}`;
// The state (fruiting, spent, contaminated) sits under the block code on a phone.
const firstHeaders = ["Block", "Strain", "BE %", "Last flush"];

const headerTexts = async (blocks: BlocksPage) =>
  (await blocks.page.locator("thead th:visible").allTextContents()).map((text) => text.replace(/[▲▼↕]/g, "").trim());

beforeAll(async () => {
  phone = await openBrowser({ width: 390, height: 844 });
  laptop = await openBrowser({ width: 1366, height: 900 });
  inspector = superuserPool();
  // A finished block of Fernbrook's with at least two flushes: its page draws a line and its own shares.
  const { rows } = await inspector.query<{ id: string; code: string }>(
    `select b.id, b.code from blocks b join farms f on f.id = b.farm_id
     where f.name = 'Fernbrook Farm' and b.spent_mass_g is not null and not b.contaminated
       and (select count(*) from harvests h where h.block_id = b.id) >= 2
     order by b.code limit 1`,
  );
  block = rows[0];
  await inspector.query("update blocks set notes = $2 where id = $1", [block.id, note]);
});

afterAll(async () => {
  if (block) await inspector.query("update blocks set notes = '' where id = $1", [block.id]);
  await phone?.close();
  await laptop?.close();
  await inspector?.end();
});

describe("blocks and a block's page, at both widths", () => {
  it("shows a phone the columns a grower needs first, and the others one tap away", async () => {
    const page = await phone.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("grower@fernbrook.example");
    // On a phone the menu (and the member's name in it) is folded away.
    await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
    const blocks = new BlocksPage(page);
    await blocks.open();
    await page.getByRole("table", { name: "Blocks and harvests" }).waitFor();
    expect(await headerTexts(blocks)).toEqual(firstHeaders);
    const firstCells = await page.locator("tbody tr td:first-child").allInnerTexts();
    expect(firstCells.every((text) => /\n(fruiting|spent|contaminated|no harvest yet)$/.test(text.trim()))).toBe(true);
    expect(await page.getByRole("columnheader", { name: /Recipe/ }).isVisible()).toBe(false);
    // The first columns fit the phone's width: the table needs no sideways scrolling.
    expect(await page.locator("table").evaluate((table) => table.scrollWidth <= (table.parentElement?.clientWidth ?? 0))).toBe(true);
    await screenshot(page, "blocks-390-first-columns");

    const more = page.getByRole("button", { name: /Show all columns/ });
    expect(await more.getAttribute("aria-pressed")).toBe("false");
    await more.focus();
    await page.keyboard.press("Enter");
    await page.getByRole("columnheader", { name: /Recipe/ }).waitFor();
    expect(await headerTexts(blocks)).toEqual(
      expect.arrayContaining([...firstHeaders, "State", "Recipe", "Inoculated", "Season", "Mass loss"]),
    );
    expect(await page.getByRole("button", { name: "Show fewer columns" }).getAttribute("aria-pressed")).toBe("true");
    await screenshot(page, "blocks-390-all-columns");
    expect(await pageLayoutProblems(page)).toEqual([]);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("finds a block by a word of its note, from the address", async () => {
    const page = await phone.newPage();
    const errors = collectPageErrors(page);
    const blocks = new BlocksPage(page);
    await blocks.open();
    await blocks.search("HUMIDIFIER");
    expect(page.url()).toMatch(/\/blocks\?q=HUMIDIFIER$/);
    expect(await blocks.blockCodes()).toEqual([block.code]);
    await page.getByRole("status").filter({ hasText: "1 block with “HUMIDIFIER” in the code or the note." }).waitFor();
    await screenshot(page, "blocks-390-search-by-note");
    await page.goto(`${appUrl}/blocks?q=${encodeURIComponent("no block has this in its note")}`);
    await page.getByText(/No block has “no block has this in its note” in its code or note/).waitFor();
    expect(errors).toEqual([]);
    await page.close();
  });

  it("shows every column on a laptop", async () => {
    const page = await laptop.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("grower@fernbrook.example");
    await new AppShell(page).waitUntilSignedIn();
    const blocks = new BlocksPage(page);
    await blocks.open();
    await page.getByRole("table", { name: "Blocks and harvests" }).waitFor();
    expect(await page.getByRole("button", { name: /Show all columns/ }).isVisible()).toBe(false);
    expect(await headerTexts(blocks)).toEqual([
      "Block",
      "Strain",
      "BE %",
      "State",
      "Last flush",
      "Recipe",
      "Inoculated",
      "Season",
      "Wet block",
      "Moisture",
      "Flushes",
      "Total fresh",
      "Mass loss",
      "Trial",
    ]);
    const be = await page.locator("tbody tr td:nth-child(3)").allTextContents();
    expect(be.filter((text) => text.includes("%")).every((text) => /^\d+\.\d %$/.test(text.trim()))).toBe(true);
    await screenshot(page, "blocks-1366");
    expect(await pageLayoutProblems(page)).toEqual([]);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("draws the block's flushes over time beside the co-op's curve for its strain", async () => {
    for (const context of [phone, laptop]) {
      const page = await context.newPage();
      const errors = collectPageErrors(page);
      await page.goto(`${appUrl}/blocks/${block.id}`);
      const chart = page.getByTestId("block-flush-chart");
      await chart.waitFor();
      await chart.locator("svg[role=img]").first().waitFor();
      // The block's own line, and the co-op's (published for the demo's strains, every farm grows them) with the block's shares.
      expect(await chart.locator("svg[role=img]").count()).toBe(2);
      const overTime = await chart.locator("svg[role=img]").first().getAttribute("aria-label");
      expect(overTime).toMatch(/^Block .+: flush 1, \d+\.\d; flush 2, \d+\.\d/);
      const shares = await chart.locator("svg[role=img]").nth(1).getAttribute("aria-label");
      expect(shares).toMatch(/^Co-op, .+: flush 1 \d+ %/);
      expect(shares).toContain(`Block ${block.code}: flush 1`);
      await page.getByText(/Co-op line: the mean share of yield by flush/).waitFor();
      await screenshot(page, `blocks-flush-chart-${context === phone ? 390 : 1366}`);
      expect(await pageLayoutProblems(page)).toEqual([]);
      expect(errors).toEqual([]);
      await page.close();
    }
  });
});
