import { readdirSync, statSync } from "node:fs";
import path from "node:path";
import type { Pool } from "pg";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { superuserPool } from "../integration/support/database";
import { mailsTo, mailTo, tokenIn } from "../support/mailbox";
import { appUrl, collectPageErrors, openBrowser, screenshot } from "./support/browser";
import { AcceptInvitationPage, FarmPeoplePage, MembersPage } from "./support/member-pages";
import { AppShell, SignInPage } from "./support/pages";

/**
 * Attack: a coordinator (or anyone signed in) looks for another person's invitation or reset link
 * on every page and every JSON route of the running app, to take over that account. The links
 * are made by the app's own mail job and read here only from the local mail server's inbox.
 */

const run = Date.now().toString(36);
const observerInvitee = `adviser-${run}@extension.example`;
const growerInvitee = `picker-${run}@fernbrook.example`;
const resetMember = "manager@stonebank.example";

const callers = [
  "coordinator@aldervalley.example",
  "manager@fernbrook.example",
  "grower@fernbrook.example",
  "observer@extension.example",
  "manager@hollowoak.example",
];

/** Every page and GET route of the app, with its dynamic segments filled in. */
function appAddresses(ids: Record<string, string>): string[] {
  const found: string[] = [];
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const full = path.join(dir, name);
      if (statSync(full).isDirectory()) walk(full);
      else if (name === "page.tsx" || name === "route.ts") found.push(path.dirname(full));
    }
  };
  walk("app");
  return found
    .map((dir) =>
      dir
        .replace(/^app/, "")
        .replace(/\/\([^)]+\)/g, "")
        .replace(/\[(\w+)\]/g, (_, name: string) => ids[name] ?? "x")
        .replace(/^$/, "/"),
    )
    .filter((address) => !address.startsWith("/api/auth") && !address.endsWith("/check") && !address.endsWith("/commit"))
    .map((address) => (address.startsWith("/api/results") ? `${address}?species=${ids.speciesId}&window=all` : address));
}

let inspector: Pool;
let browser: BrowserContext;
let tokens: string[];
let ids: Record<string, string>;

beforeAll(async () => {
  inspector = superuserPool();
  browser = await openBrowser();
  const one = async (query: string) => (await inspector.query<{ id: string }>(query)).rows[0].id;
  ids = {
    trialId: await one("select id from trials where code = 'T-2026-01'"),
    blockId: await one("select b.id from blocks b join farms f on f.id = b.farm_id where f.name = 'Fernbrook Farm' limit 1"),
    // A made-up upload id: the upload routes answer 404 for it, which is all this test needs from them.
    uploadId: "00000000-0000-4000-8000-000000000000",
    speciesId: await one("select id from species where common_name ilike '%oyster%'"),
    token: "x",
  };
});

afterAll(async () => {
  await browser?.close();
  await inspector?.end();
});

describe("one-time links", () => {
  it("are made when the coordinator, a farm manager and the reset form ask, and arrive in the addressee's inbox", async () => {
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("coordinator@aldervalley.example");
    await new AppShell(page).waitUntilSignedIn();
    const members = new MembersPage(page);
    await members.open();
    await page.getByTestId("invite-member").getByLabel("Farm (for a farm manager)").selectOption({ label: "No farm (co-op role)" });
    const form = page.getByTestId("invite-member");
    await form.getByLabel("Their e-mail").fill(observerInvitee);
    await form.getByLabel("Role").selectOption({ label: "Observer" });
    await form.getByRole("button", { name: "Send invitation" }).click();
    await form.getByRole("status").waitFor();
    await new AppShell(page).signOut();

    await new SignInPage(page).signIn("manager@fernbrook.example");
    await new AppShell(page).waitUntilSignedIn();
    const farmPeople = new FarmPeoplePage(page);
    await farmPeople.open();
    expect(await farmPeople.inviteGrower(growerInvitee)).toContain(`Invitation sent to ${growerInvitee}`);
    await new AppShell(page).signOut();

    const resetsBefore = (await mailsTo(resetMember, /Reset/)).length;
    await page.goto(`${appUrl}/reset-password`);
    await page.getByTestId("request-reset").getByLabel("E-mail").fill(resetMember);
    await page.getByTestId("request-reset").getByRole("button", { name: "E-mail me a reset link" }).click();
    await page.getByTestId("request-reset").getByRole("status").waitFor();

    // The app's mail job sends them after each commit, within a few seconds.
    tokens = [
      tokenIn((await mailTo(observerInvitee, /invited/, { timeout: 30_000 })).text, "accept-invitation"),
      tokenIn((await mailTo(growerInvitee, /invited/, { timeout: 30_000 })).text, "accept-invitation"),
      tokenIn((await mailTo(resetMember, /Reset/, { count: resetsBefore + 1, timeout: 30_000 })).text, "reset-password"),
    ];
    expect(errors).toEqual([]);
  });

  it("appear on no page and in no JSON answer, for any role", async () => {
    const addresses = appAddresses(ids);
    expect(addresses).toEqual(
      expect.arrayContaining([
        "/outgoing-mail",
        "/members",
        "/activity",
        "/farm-people",
        `/api/results?species=${ids.speciesId}&window=all`,
      ]),
    );
    for (const email of callers) {
      await browser.clearCookies();
      const page = await browser.newPage();
      await new SignInPage(page).signIn(email);
      await new AppShell(page).waitUntilSignedIn();
      for (const address of addresses) {
        const response = await page.request.get(`${appUrl}${address}`, { maxRedirects: 0 });
        const body = await response.text();
        expect(response.status(), `${email} ${address}`).toBeLessThan(500);
        for (const token of tokens) expect(body.includes(token), `${email} found a link on ${address}`).toBe(false);
      }
      await page.close();
    }
  });

  it("are replaced on the coordinator's Outgoing mail page by a record of what was sent", async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("coordinator@aldervalley.example");
    await new AppShell(page).waitUntilSignedIn();
    await page.goto(`${appUrl}/outgoing-mail`);
    const table = page.getByRole("table", { name: "Outgoing mail" });
    await table.waitFor();
    // The record says "Sent" once the mail job has had the mail server's answer.
    await expect
      .poll(
        async () => {
          await page.reload();
          return (await table.getByRole("row").filter({ hasText: growerInvitee }).textContent()) ?? "";
        },
        { timeout: 20_000, interval: 500 },
      )
      .toMatch(/Invitation.*Sent/);
    expect(await page.content()).not.toMatch(/accept-invitation\?token=|reset-password\?token=/);
    await screenshot(page, "outgoing-mail-record");
    expect(errors).toEqual([]);
  });

  it("can be sent again (the earlier one stops working) and cancelled (then it opens nothing) from the Members page", async () => {
    const email = `twice-${run}@extension.example`;
    await browser.clearCookies();
    const page = await browser.newPage();
    const errors = collectPageErrors(page);
    page.on("dialog", (dialog) => void dialog.accept());
    await new SignInPage(page).signIn("coordinator@aldervalley.example");
    await new AppShell(page).waitUntilSignedIn();
    const members = new MembersPage(page);
    await members.open();
    const form = page.getByTestId("invite-member");
    await form.getByLabel("Their e-mail").fill(email);
    await form.getByLabel("Role").selectOption({ label: "Observer" });
    await form.getByLabel("Farm (for a farm manager)").selectOption({ label: "No farm (co-op role)" });
    await form.getByRole("button", { name: "Send invitation" }).click();
    await form.getByRole("status").waitFor();
    const first = (await mailTo(email, /invited/, { timeout: 30_000 })).text.match(/\S+\/accept-invitation\?token=\S+/)![0];

    // A second invitation to the same address is refused with what to do instead.
    await members.open();
    await form.getByLabel("Their e-mail").fill(email);
    await form.getByLabel("Role").selectOption({ label: "Observer" });
    await form.getByLabel("Farm (for a farm manager)").selectOption({ label: "No farm (co-op role)" });
    await form.getByRole("button", { name: "Send invitation" }).click();
    await expect.poll(async () => (await form.getByRole("alert").textContent()) ?? "", { timeout: 10_000 }).toMatch(/already open/);
    expect(await form.textContent()).toContain("Resend or cancel it under Open invitations");
    await screenshot(page, "members-invitation-already-open");

    await members.open();
    await page.getByTestId(`resend-${email}`).getByRole("button", { name: "Send again" }).click();
    await page.getByTestId(`resend-${email}`).getByRole("status").waitFor();
    const second = (await mailTo(email, /invited/, { count: 2, timeout: 30_000 })).text.match(/\S+\/accept-invitation\?token=\S+/)![0];
    expect(second).not.toBe(first);
    const visitor = await browser.newPage();
    const accept = new AcceptInvitationPage(visitor);
    await accept.open(first);
    expect(await accept.refusal()).toMatch(/not one we sent/);

    await members.open();
    await page.getByTestId(`cancel-${email}`).getByRole("button", { name: "Cancel invitation" }).click();
    // A cancelled invitation leaves the list of open ones.
    await page.getByTestId(`cancel-${email}`).waitFor({ state: "detached" });
    await screenshot(page, "members-invitation-cancelled");
    await accept.open(second);
    expect(await accept.refusal()).toMatch(/expired/);
    expect(errors).toEqual([]);
  });
});
