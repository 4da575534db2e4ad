import type { Pool } from "pg";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signOptOutToken } from "@/lib/trials/reminder-opt-out";
import { superuserPool } from "../integration/support/database";
import { appUrl, collectPageErrors, openBrowser, screenshot, seriousAccessibilityProblems } from "./support/browser";

/** A mail scanner opens the unsubscribe link first; then the farm manager does, and changes their mind. */

let inspector: Pool;
let browser: BrowserContext;
let enrolment: { id: string; code: string; allowed: boolean };
let link: string;

const allowed = async () =>
  (await inspector.query<{ reminders_allowed: boolean }>("select reminders_allowed from trial_enrolments where id = $1", [enrolment.id]))
    .rows[0].reminders_allowed;

beforeAll(async () => {
  inspector = superuserPool();
  const { rows } = await inspector.query<{ id: string; code: string; reminders_allowed: boolean }>(
    "select e.id, t.code, e.reminders_allowed from trial_enrolments e join trials t on t.id = e.trial_id order by t.code desc, e.id limit 1",
  );
  enrolment = { id: rows[0].id, code: rows[0].code, allowed: rows[0].reminders_allowed };
  await inspector.query("update trial_enrolments set reminders_allowed = true where id = $1", [enrolment.id]);
  link = `${appUrl}/unsubscribe/${signOptOutToken(enrolment.id, process.env.AUTH_SECRET!)}`;
  browser = await openBrowser();
});

afterAll(async () => {
  await browser?.close();
  await inspector.query("update trial_enrolments set reminders_allowed = $2 where id = $1", [enrolment.id, enrolment.allowed]);
  await inspector.end();
});

describe("the unsubscribe link in a trial e-mail", () => {
  it("changes nothing when a scanner fetches it, asks before stopping, and offers the undo", async () => {
    const page = browser.pages()[0] ?? (await browser.newPage());
    const errors = collectPageErrors(page);
    for (let fetched = 0; fetched < 3; fetched++) expect((await page.request.get(link)).status()).toBe(200);
    expect(await allowed()).toBe(true);

    await page.goto(link);
    await page.getByRole("heading", { name: `Stop reminders about trial ${enrolment.code}?` }).waitFor();
    expect(await allowed()).toBe(true);
    await screenshot(page, "unsubscribe-asks");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);

    await page.getByRole("button", { name: "Stop reminders" }).click();
    await page.getByRole("heading", { name: "Reminders stopped" }).waitFor();
    expect(await allowed()).toBe(false);
    await screenshot(page, "unsubscribe-stopped");

    await page.getByRole("button", { name: "Undo: send reminders again" }).click();
    await page.getByRole("heading", { name: "Reminders are on again" }).waitFor();
    expect(await allowed()).toBe(true);
    expect(errors).toEqual([]);
  });
});
