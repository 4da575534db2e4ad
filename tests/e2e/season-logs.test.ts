import { readFileSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Pool } from "pg";
import type { BrowserContext } from "playwright-core";
import { superuserPool } from "../integration/support/database";
import { collectPageErrors, openBrowser, screenshot } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";
import { BlocksPage, QuickHarvestPage, SeasonLogPage } from "./support/season-log-pages";

// A sheet as a European-locale spreadsheet exports it: semicolons, decimal commas, day-first
// dates, a weight column headed in the farm's own words ("Picked (g)"), and the tent each block fruited in.
const header = "Block;Strain;Substrate;Inoculated;Wet block (kg);Moisture;Tent;Flush;Harvested;Picked (g)";
const rows = (strainOfSecond: string) =>
  [
    "E2E-01;PO-01;HWB-20;02.03.2026;2,5;62 %;E2E tent;1;14.04.2026;612,5",
    "E2E-01;PO-01;HWB-20;02.03.2026;2,5;62 %;;2;29.04.2026;380",
    `E2E-02;${strainOfSecond};HWB-20;02.03.2026;2,4;62 %;e2e TENT;1;15.04.2026;540,0`,
  ].join("\r\n");
const withTypo = `${header}\r\n${rows("PO-1O")}\r\n`;
const corrected = `${header}\r\n${rows("PO-01")}\r\n`;

describe("a grower uploads a season log", () => {
  let browser: BrowserContext;
  let inspector: Pool;
  beforeAll(async () => {
    browser = await openBrowser();
    // The farm's tent, as the Rooms page would have recorded it: a season log only names rooms the farm has.
    inspector = superuserPool();
    await inspector.query(
      `insert into fruiting_rooms (farm_id, name, kind, fresh_air) select id, 'E2E tent', 'tent', 'filter_holes' from farms where name = 'Fernbrook Farm'
       on conflict do nothing`,
    );
  });
  afterAll(async () => {
    await browser?.close();
    await inspector?.end();
  });

  it("maps a column, sees an error, uploads the corrected file, commits and finds the blocks", async () => {
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("grower@fernbrook.example");
    await new AppShell(page).waitUntilSignedIn();

    const logs = new SeasonLogPage(page);
    await logs.open();
    await screenshot(page, "season-logs-1-empty");

    await logs.upload("fernbrook-season.csv", withTypo);
    expect(await logs.summary()).toContain("“;” between columns, “,” as decimal mark");
    // Matched on the issues' codes, not their wording.
    expect((await logs.issues()).map((issue) => issue.code)).toContain("unmatched_columns");
    expect(await logs.commitButton().isDisabled()).toBe(true);
    await screenshot(page, "season-logs-2-needs-mapping");

    await logs.mapColumn("Picked (g)", "Fresh weight");
    await logs.checkAgain();
    expect(await logs.issues()).toEqual([{ code: "unknown_strain", value: "PO-1O" }]);
    expect(await logs.commitButton().isDisabled()).toBe(true);
    await screenshot(page, "season-logs-3-error");

    await logs.startOver();
    await logs.upload("fernbrook-season-corrected.csv", corrected);
    expect(await logs.summary()).toContain("0 errors");
    expect(await logs.previewCounts()).toMatch(/New blocks\s*2.*New harvests\s*3/);
    // Each block's room, by the farm's own name for it, whatever the capitals in the file.
    expect(await logs.previewRooms()).toMatch(/E2E-01\s*E2E tent.*E2E-02\s*E2E tent/);
    expect(await logs.commitButton().isEnabled()).toBe(true);
    await screenshot(page, "season-logs-4-review");

    const receipt = await logs.commit();
    expect(receipt).toContain("2 new blocks");
    expect(receipt).toContain("3 new harvests");
    // The list of past uploads follows the commit without a reload.
    const row = page.getByRole("row", { name: /fernbrook-season-corrected\.csv.*Committed/ });
    await row.waitFor();
    await screenshot(page, "season-logs-5-receipt");
    // One row for the upload, what its check found folded into it.
    await row.getByText("What the check found").click();
    await row.getByText("2 new blocks and 3 new harvests").waitFor();
    expect(await row.getByText(/^3 rows, 0 errors and \d+ warnings?$/).count()).toBe(1);
    await row.scrollIntoViewIfNeeded();
    await screenshot(page, "season-logs-5b-past-upload-checks");

    const blocks = new BlocksPage(page);
    await blocks.open();
    await blocks.search("E2E-");
    expect(await blocks.blockCodes()).toEqual(["E2E-01", "E2E-02"]);
    await screenshot(page, "season-logs-6-blocks");
    expect(errors).toEqual([]);
    await page.close();
  });

  it("uploads an .xlsx workbook LibreOffice wrote, chooses its sheet, and commits its typed cells", async () => {
    // A browser of its own: the first test's is signed in already.
    const desk = await openBrowser();
    const page = await desk.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("grower@fernbrook.example");
    await new AppShell(page).waitUntilSignedIn();
    const logs = new SeasonLogPage(page);
    await logs.open();
    // tests/fixtures/spreadsheets/README.md: LibreOffice Calc 7.4 under de-DE, two sheets, dates and
    // date-times, grouped whole grams (2.500 as shown), 0,612 kg, a percentage and booleans as cells.
    const workbook = readFileSync(path.resolve(__dirname, "../fixtures/spreadsheets/e2e-fernbrook-de-DE.xlsx"));
    await logs.uploadFile("fernbrook-2026.xlsx", workbook, "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet");
    expect(await logs.summary()).toContain("read from the sheet “Harvests” of the .xlsx file");
    expect(await logs.issues()).toEqual([{ code: "sheet_choice_needed", value: "" }]);
    expect(await logs.commitButton().isDisabled()).toBe(true);
    await screenshot(page, "season-logs-9-xlsx-choose-sheet");

    await logs.chooseSheet("Harvests");
    await logs.checkAgain();
    expect(await logs.summary()).toContain("0 errors");
    expect(await logs.issues()).toEqual([]);
    expect(await logs.previewCounts()).toMatch(/New blocks\s*2.*New harvests\s*3/);
    await screenshot(page, "season-logs-10-xlsx-review");
    const receipt = await logs.commit();
    expect(receipt).toContain("2 new blocks");
    expect(receipt).toContain("3 new harvests");
    await page.getByRole("row", { name: /fernbrook-2026\.xlsx.*Committed/ }).waitFor();
    await screenshot(page, "season-logs-11-xlsx-receipt");

    const blocks = new BlocksPage(page);
    await blocks.open();
    await blocks.search("XL-");
    expect(await blocks.blockCodes()).toEqual(["XL-01", "XL-02"]);
    expect(errors).toEqual([]);
    await desk.close();
  });

  it("records the next flush from the quick form on a phone", async () => {
    const phone = await openBrowser({ width: 390, height: 844 });
    try {
      const page = await phone.newPage();
      await new SignInPage(page).signIn("grower@fernbrook.example");
      // On a phone the menu (and the member's name in it) is folded away.
      await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
      const form = new QuickHarvestPage(page);
      await form.open();
      expect(await form.suggestedFlushFor("E2E-02")).toBe("2");
      await screenshot(page, "season-logs-7-quick-harvest");
      expect(await form.weightKeypad()).toBe("text");
      // The confirmation repeats the weight as typed, then in the member's units.
      expect(await form.record("1 lb 2 oz", "g")).toContain("Saved flush 2 of E2E-02: 1 lb 2 oz (510 g)");
      await screenshot(page, "season-logs-8-quick-harvest-saved");

      // Flush 4 with no flush 3, typed in lower case and in ounces: questioned, then saved anyway.
      await form.suggestedFlushFor("e2e-02");
      expect(await form.recordQuestioned("4", "12", "oz")).toContain("no flush 3");
      await screenshot(page, "season-logs-9-quick-harvest-warning");
      expect(await form.saveAnyway()).toContain("Saved flush 4 of E2E-02: 12 oz (340 g)");
      // The unit picked stays picked on the next visit.
      await form.open();
      expect(await form.showsUnit("oz")).toBe(true);

      const blocks = new BlocksPage(page);
      await blocks.open();
      await blocks.search("E2E-02");
      await page.getByRole("link", { name: "E2E-02" }).click();
      const kept = page.getByTestId("accepted-warnings-4");
      await kept.waitFor();
      expect(await kept.textContent()).toContain("no flush 3");
      expect(await page.getByRole("cell", { name: "12 oz", exact: true }).count()).toBe(1);
      await screenshot(page, "season-logs-10-block-with-warning-kept");
    } finally {
      await phone.close();
    }
  });
});
