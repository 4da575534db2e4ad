/**
 * The phone harvest form without a signal, in Chromium against the built app with its service
 * worker. Before: a save with no signal replaced the form with "Your blocks could not be shown"
 * and the entry was lost. Now the form opens with the phone offline, three flushes saved offline
 * wait on the phone with their count shown, and when the signal returns each arrives exactly
 * once. An answer lost after the server stored the entry (as when the server is killed after it
 * committed) is sent again with the same key and still stored once. An entry the server refuses
 * (a flush stored already) waits as "Not saved" until the grower puts it back in the form.
 */
import type { Pool } from "pg";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { superuserPool } from "../integration/support/database";
import { openBrowser, screenshot } from "./support/browser";
import { SignInPage } from "./support/pages";
import { QuickHarvestPage } from "./support/season-log-pages";

let inspector: Pool;
let phone: BrowserContext;
let block: { code: string; flushes: number };

beforeAll(async () => {
  inspector = superuserPool();
  // Fernbrook's healthy block with the lowest efficiency so far: three 50 g flushes more raise no warning.
  const { rows } = await inspector.query<{ code: string; flushes: number }>(
    `select b.code, coalesce(max(h.flush), 0)::int as flushes
       from blocks b join farms f on f.id = b.farm_id left join harvests h on h.block_id = b.id
      where f.name ilike 'fernbrook%' and not b.contaminated and b.wet_mass_g is not null and b.moisture is not null
        and b.inoculated_on < current_date - 30
      group by b.id
     having coalesce(max(h.flush), 0) <= 10
      order by coalesce(sum(h.fresh_mass_g), 0) / (b.wet_mass_g * (1 - b.moisture)) limit 1`,
  );
  block = rows[0];
  phone = await openBrowser({ width: 390, height: 844 });
});

afterAll(async () => {
  await phone?.close();
  await inspector?.end();
});

async function storedFlushes(): Promise<{ flush: number; keyed: boolean }[]> {
  const { rows } = await inspector.query<{ flush: number; keyed: boolean }>(
    `select h.flush, h.client_key is not null as keyed from harvests h join blocks b on b.id = h.block_id
      where b.code = $1 and h.flush > $2 order by h.flush`,
    [block.code, block.flushes],
  );
  return rows;
}

async function recordFlush(page: Page, flush: number): Promise<void> {
  await page.getByLabel("Block code").fill(block.code);
  await page.getByLabel("Flush").fill(String(flush));
  await page.getByLabel("Fresh weight").fill("50");
  await page.getByLabel("Unit").selectOption("g");
  await page.getByRole("button", { name: "Save this flush" }).click();
}

const queue = (page: Page) => page.getByTestId("phone-queue");

describe("the phone harvest form without a signal", () => {
  it("opens offline, keeps three flushes on the phone with their count, and sends each once when the signal returns", async () => {
    const page = await phone.newPage();
    await new SignInPage(page).signIn("grower@fernbrook.example");
    await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
    const form = new QuickHarvestPage(page);
    await form.open();
    // The worker has taken over and keeps this page for opening without a signal.
    await page.waitForFunction(() => navigator.serviceWorker.controller !== null, undefined, { timeout: 30_000 });
    // Polled from here: waitForFunction would take the predicate's promise itself for a yes.
    await expect
      .poll(() => page.evaluate(async () => (await caches.match("/blocks/harvest", { ignoreSearch: true })) !== undefined), {
        timeout: 30_000,
      })
      .toBe(true);

    await phone.setOffline(true);
    await page.reload();
    await page.getByRole("heading", { name: "Record a harvest" }).waitFor();
    await screenshot(page, "offline-1-form-opened-without-signal");

    for (const [i, flush] of [block.flushes + 1, block.flushes + 2, block.flushes + 3].entries()) {
      await recordFlush(page, flush);
      await page.getByText(`Saved on this phone, not sent yet (${i + 1})`).waitFor();
    }
    expect(await queue(page).textContent()).toBe("Saved on this phone, not sent yet (3)");
    expect(await page.getByText("could not be shown").count()).toBe(0);
    // The next flush counts the ones kept on the phone.
    expect(await page.getByLabel("Flush").inputValue()).toBe(String(block.flushes + 4));
    await screenshot(page, "offline-2-three-flushes-waiting");
    expect(await storedFlushes()).toEqual([]);

    // The signal returns: the page hears it and sends them, oldest first.
    await phone.setOffline(false);
    await page.getByText("Sent 3 entries kept on this phone.").waitFor({ timeout: 30_000 });
    expect(await queue(page).count()).toBe(0);
    await screenshot(page, "offline-3-sent-when-online");
    const expected = [1, 2, 3].map((n) => ({ flush: block.flushes + n, keyed: true }));
    expect(await storedFlushes()).toEqual(expected);

    // Opening the page again sends nothing more.
    await form.open();
    await page.waitForTimeout(1_000);
    expect(await storedFlushes()).toEqual(expected);
    await page.close();
  });

  it("an answer lost after the server stored the entry (a server killed after it committed) is sent again and stored once", async () => {
    const page = await phone.newPage();
    await new QuickHarvestPage(page).open();
    // The save reaches the server and is stored, but its answer never reaches the phone.
    await page.route("**/blocks/harvest*", async (route) => {
      if (route.request().method() !== "POST") return route.fallback();
      await route.fetch();
      await route.abort("connectionreset");
    });
    await recordFlush(page, block.flushes + 4);
    await page.getByText("Saved on this phone, not sent yet (1)").waitFor();
    await screenshot(page, "offline-4-answer-lost-entry-kept");
    expect((await storedFlushes()).map((row) => row.flush)).toContain(block.flushes + 4);

    await page.unroute("**/blocks/harvest*");
    await page.getByRole("button", { name: "Send now" }).click();
    await page.getByText("Sent 1 entry kept on this phone.").waitFor({ timeout: 30_000 });
    expect((await storedFlushes()).filter((row) => row.flush === block.flushes + 4)).toHaveLength(1);
    await page.close();
  });

  it("an entry kept offline that the server refuses waits for the grower, who puts it back in the form", async () => {
    const page = await phone.newPage();
    await new QuickHarvestPage(page).open();
    await phone.setOffline(true);
    // Flush 1 of the block again: stored already, so the server will refuse it as a duplicate.
    await recordFlush(page, block.flushes + 1);
    await page.getByText("Saved on this phone, not sent yet (1)").waitFor();
    await phone.setOffline(false);
    const refused = page.getByRole("alert").filter({ hasText: `Not saved: flush ${block.flushes + 1} of ${block.code}` });
    await refused.waitFor({ timeout: 30_000 });
    expect(await queue(page).count()).toBe(0);
    await screenshot(page, "offline-5-refused-entry-waits");
    await refused.getByRole("button", { name: "Put back in the form" }).click();
    await refused.waitFor({ state: "detached" });
    expect(await page.getByLabel("Flush").inputValue()).toBe(String(block.flushes + 1));
    expect(await page.getByLabel("Fresh weight").inputValue()).toBe("50");
    expect((await storedFlushes()).filter((row) => row.flush === block.flushes + 1)).toHaveLength(1);
    await page.close();
  });
});
