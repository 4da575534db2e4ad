/**
 * A room's climate log in the browser: a farm manager uploads a logger's file for a room, is told
 * what was stored, sees the humidity and temperature chart with the regime change marked, and a
 * flush grown in the room summarised in words. The same file again is refused by name.
 * Screenshot `climate-room.png`.
 */
import type { Pool } from "pg";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { superuserPool } from "../integration/support/database";
import { appUrl, collectPageErrors, openBrowser, screenshot, seriousAccessibilityProblems } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";

let browser: BrowserContext;
let inspector: Pool;
let roomId: string;
const roomName = "Climate test tub";
const dayMs = 86_400_000;

/** A flooded room, logged every 30 minutes with UTC offsets in the file: wet from 07:00 to 13:00, 80 % RH otherwise. */
function loggerFile(fromMs: number, toMs: number): Buffer {
  const lines = ["Timestamp,Temperature (°C),Relative humidity (%)"];
  for (let at = fromMs; at < toMs; at += 30 * 60_000) {
    const hour = new Date(at).getUTCHours();
    lines.push(`${new Date(at).toISOString().slice(0, 19)}Z,${hour < 12 ? "17.5" : "18.5"},${hour >= 7 && hour < 13 ? "95.0" : "80.0"}`);
  }
  return Buffer.from(lines.join("\n"));
}

let file: Buffer;

beforeAll(async () => {
  browser = await openBrowser();
  inspector = superuserPool();
  const farm = (await inspector.query<{ id: string }>("select id from farms where name = 'Fernbrook Farm'")).rows[0].id;
  roomId = (
    await inspector.query<{ id: string }>(
      "insert into fruiting_rooms (farm_id, name, kind, fresh_air) values ($1, $2, 'tub', 'fan_timer') returning id",
      [farm, roomName],
    )
  ).rows[0].id;
  // A block in no demo room, whose first flush grew in this room for the six days before it was picked.
  const block = (
    await inspector.query<{ id: string; first: string }>(
      `select b.id, min(h.harvested_on)::text as first from blocks b join harvests h on h.block_id = b.id
       where b.farm_id = $1 and h.harvested_on is not null
         and not exists (select 1 from block_room_moves m where m.block_id = b.id)
       group by b.id order by b.code limit 1`,
      [farm],
    )
  ).rows[0];
  const firstHarvest = Date.parse(`${block.first}T00:00:00Z`);
  const movedOn = new Date(firstHarvest - 6 * dayMs).toISOString().slice(0, 10);
  await inspector.query("insert into block_room_moves (farm_id, block_id, room_id, moved_on) values ($1, $2, $3, $4)", [
    farm,
    block.id,
    roomId,
    movedOn,
  ]);
  await inspector.query(
    "insert into room_regimes (farm_id, room_id, starts_on, humidity_mode, flood_starts_at, flood_hours) values ($1, $2, $3, 'flooding', '07:00', 6)",
    [farm, roomId, new Date(firstHarvest - 3 * dayMs).toISOString().slice(0, 10)],
  );
  // A day either side, so the window is covered whatever zone the page reads days in.
  file = loggerFile(firstHarvest - 7 * dayMs, firstHarvest + 2 * dayMs);
});

afterAll(async () => {
  await inspector?.query("delete from fruiting_rooms where name = $1", [roomName]);
  await browser?.close();
  await inspector?.end();
});

describe("a room's climate log", () => {
  it("is uploaded by a farm manager and shown as a chart and per flush", async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("manager@fernbrook.example");
    await new AppShell(page).waitUntilSignedIn();
    await page.goto(`${appUrl}/rooms/${roomId}/climate`);
    await page.getByRole("heading", { name: `Climate: ${roomName}` }).waitFor();
    await page.getByText("Carbon dioxide in closed rooms").waitFor();

    const form = page.getByTestId("climate-upload");
    await form.getByLabel("Logger file (CSV)").setInputFiles({ name: "tub-log.csv", mimeType: "text/csv", buffer: file });
    await form.getByLabel("The logger's clock was in").selectOption("UTC");
    await form.getByRole("button", { name: "Upload" }).click();
    await form.getByText(/Stored 432 readings/).waitFor();

    const chart = page.getByTestId("climate-chart");
    await chart.locator("svg path").first().waitFor();
    expect(await chart.locator("svg").count()).toBeGreaterThanOrEqual(2);
    // 9 days × 48 readings = 432; wet 07:00–13:00 is 6 h a day; driest 80 %; dry from 13:00 to 07:00 next day, 18 h.
    const row = page.getByRole("row").filter({ hasText: /a day above 90 % RH/ });
    await row.waitFor();
    expect(await row.textContent()).toMatch(/6 h a day above 90 % RH; driest 80 %; longest dry spell \(under 85 % RH\) 18 h/);
    await screenshot(page, "climate-room");

    await form.getByLabel("Logger file (CSV)").setInputFiles({ name: "tub-log-again.csv", mimeType: "text/csv", buffer: file });
    await form.getByLabel("The logger's clock was in").selectOption("UTC");
    await form.getByRole("button", { name: "Upload" }).click();
    await form.getByText(/This file was uploaded before \(as 'tub-log.csv'/).waitFor();

    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    expect(errors).toEqual([]);
    await page.close();
  });
});
