import type { BrowserContext } from "playwright-core";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { superuserPool } from "../integration/support/database";
import { mailTo } from "../support/mailbox";
import { appUrl, collectPageErrors, openBrowser, screenshot } from "./support/browser";
import { AcceptInvitationPage, FarmPeoplePage, MembersPage } from "./support/member-pages";
import { AppShell, SignInPage } from "./support/pages";

const run = Date.now().toString(36);
const farmName = `Yarrow Hill ${run}`;
const managerEmail = `manager-${run}@yarrowhill.example`;
const growerEmail = `grower-${run}@yarrowhill.example`;
const managerPassword = "yarrow-hill-spawn-run";

let inspector: Pool;

/** The link in the newest e-mail to `to` in the local inbox, as the recipient would click it (the app's mail job sends it within seconds). */
async function linkMailedTo(to: string): Promise<string> {
  const mail = await mailTo(to, /invited/, { timeout: 30_000 });
  const link = mail.text.match(/https?:\/\/\S+\/accept-invitation\?token=[A-Za-z0-9_-]+/)?.[0];
  if (!link) throw new Error(`no invitation link in the e-mail to ${to}`);
  return link;
}

describe("admitting a farm and bringing in its people", () => {
  let coordinatorBrowser: BrowserContext;
  let managerBrowser: BrowserContext;

  beforeAll(async () => {
    inspector = superuserPool();
    coordinatorBrowser = await openBrowser();
    managerBrowser = await openBrowser({ width: 390, height: 844 });
  });

  afterAll(async () => {
    await coordinatorBrowser?.close();
    await managerBrowser?.close();
    await inspector?.end();
  });

  it("lets the coordinator admit a farm and invite its manager by e-mail", async () => {
    const page = await coordinatorBrowser.newPage();
    const errors = collectPageErrors(page);
    await new SignInPage(page).signIn("coordinator@aldervalley.example");
    await new AppShell(page).waitUntilSignedIn();
    const members = new MembersPage(page);
    await members.open();
    expect(await members.admitFarm(farmName, "Alder Heights", managerEmail)).toContain("is now a member farm");
    await members.open();
    expect(await members.farmNames()).toContain(farmName);
    expect(await members.invite(managerEmail, "Farm manager", farmName)).toContain(`Invitation sent to ${managerEmail}`);
    await screenshot(page, "members-coordinator-invited-manager");
    expect(errors).toEqual([]);
  });

  it("lets the manager accept from the e-mailed link, signs them in at once, and lets them invite a grower", async () => {
    const page = await managerBrowser.newPage();
    const errors = collectPageErrors(page);
    const link = await linkMailedTo(managerEmail);
    const accept = new AcceptInvitationPage(page);
    await accept.open(link);
    expect(await page.getByText(farmName).first().textContent()).toContain(farmName);
    await screenshot(page, "members-accept-invitation-phone");
    await accept.accept("Sofia Lindqvist", managerPassword);
    // Signed in at once, on the start page: on a phone the menu (and the member's name in it) is folded away.
    await page.waitForURL((url) => url.pathname === "/");
    await page.getByRole("main").getByRole("heading", { level: 1 }).first().waitFor();
    await screenshot(page, "members-accepted-start-page-phone");

    // The link works once.
    await accept.open(link);
    expect(await accept.refusal()).toContain("already been used");
    const farmPeople = new FarmPeoplePage(page);
    await farmPeople.open();
    expect(await farmPeople.inviteGrower(growerEmail)).toContain(`Invitation sent to ${growerEmail}`);
    await farmPeople.open();
    expect((await farmPeople.openInvitations()).join(" ")).toContain(growerEmail);
    await screenshot(page, "members-farm-people-phone");
    expect(await linkMailedTo(growerEmail)).toMatch(/accept-invitation\?token=/);
    expect(errors).toEqual([]);
  });

  it("shows the registries and the co-op activity log to the coordinator, and a farm its data rights and settings", async () => {
    const page = await coordinatorBrowser.newPage();
    const errors = collectPageErrors(page);
    await page.goto(`${appUrl}/strains`);
    await page.getByRole("heading", { name: "Strains", level: 1 }).waitFor();
    expect(await page.getByRole("table", { name: "Strains" }).getByText("PO-01").count()).toBe(1);
    await screenshot(page, "members-registries-coordinator");
    await page.goto(`${appUrl}/activity`);
    await page.getByRole("table", { name: "Co-op activity log" }).waitFor();
    const log = page.getByRole("table", { name: "Co-op activity log" });
    // Who did what, in a sentence; never the log's internal action names.
    expect(await log.textContent()).not.toMatch(/member\.invited|sign-in\.failed|"role"/);
    await page.getByPlaceholder("Type to filter rows").fill(`invited ${managerEmail}`);
    const invited = log.getByRole("row").filter({ hasText: `invited ${managerEmail} to join as a farm manager.` });
    expect(await invited.count()).toBeGreaterThan(0);
    await invited
      .first()
      .getByText(/details?$/)
      .click();
    await invited.first().getByText("The link expires on").waitFor();
    await screenshot(page, "members-activity-coordinator");
    expect(errors).toEqual([]);

    const farmPage = await managerBrowser.newPage();
    const farmErrors = collectPageErrors(farmPage);
    await farmPage.goto(`${appUrl}/farm-people/data`);
    await farmPage.getByRole("heading", { name: "Your farm's data", level: 1 }).waitFor();
    expect(await farmPage.getByText("keep their published figures").count()).toBe(1);
    await screenshot(farmPage, "members-farm-data-phone");
    await farmPage.goto(`${appUrl}/settings`);
    const preferences = farmPage.getByTestId("preferences");
    await preferences.getByLabel("Show masses in").selectOption("imperial");
    await preferences.getByRole("button", { name: "Save preferences" }).click();
    await preferences.getByRole("status").waitFor();
    const { rows } = await inspector.query<{ display_units: string }>("select display_units from users where email = $1", [managerEmail]);
    expect(rows[0].display_units).toBe("imperial");
    await screenshot(farmPage, "members-settings-phone");

    // The farm's own log: the manager's invitation and settings, in words, the particulars folded.
    await farmPage.goto(`${appUrl}/farm-activity`);
    const farmLog = farmPage.getByRole("table", { name: `${farmName} activity log` });
    await farmLog.getByText(`Sofia Lindqvist invited ${growerEmail} to join as a grower.`).waitFor();
    const changed = farmLog.getByRole("row").filter({ hasText: "Sofia Lindqvist changed their settings." });
    await changed
      .first()
      .getByText(/details?$/)
      .click();
    await changed.first().getByText("Pounds and ounces").waitFor();
    expect(await farmLog.textContent()).not.toMatch(/preferences\.changed|member\.invited|displayUnits/);
    // A farm's people are managed on its own page, so the farm's log links there, not to the co-op's members.
    expect(await farmLog.getByRole("link", { name: "Farm people" }).count()).toBeGreaterThan(0);
    expect(await farmLog.getByRole("link", { name: "Members" }).count()).toBe(0);
    await screenshot(farmPage, "members-farm-activity-phone");
    expect(farmErrors).toEqual([]);
  });
});
