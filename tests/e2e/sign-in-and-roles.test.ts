import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BrowserContext } from "playwright-core";
import { appUrl, collectPageErrors, openBrowser, screenshot, seriousAccessibilityProblems } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";

// What each demo member must see in the menu, and a page their role may not open.
const roles = [
  {
    role: "coordinator",
    email: "coordinator@aldervalley.example",
    menu: ["Follow-up", "Co-op results", "Trials", "Strains", "Members", "Activity log", "Outgoing mail", "Co-op settings", "Settings"],
    forbidden: "/season-logs",
  },
  {
    role: "farm-manager",
    email: "manager@fernbrook.example",
    menu: [
      "My farm",
      "Season logs",
      "Blocks & harvests",
      "Rooms",
      "Co-op results",
      "Trials",
      "Strains",
      "Farm people",
      "Activity log",
      "Settings",
    ],
    forbidden: "/members",
  },
  {
    role: "grower",
    email: "grower@fernbrook.example",
    menu: ["My farm", "Season logs", "Blocks & harvests", "Rooms", "Co-op results", "Trials", "Strains", "Settings"],
    forbidden: "/farm-people",
  },
  {
    role: "observer",
    email: "observer@extension.example",
    menu: ["Co-op results", "Trials", "Strains", "Settings"],
    forbidden: "/blocks",
  },
];

describe("signing in as each role", () => {
  let browser: BrowserContext;
  beforeAll(async () => {
    browser = await openBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("sends a signed-out visitor to the sign-in page", async () => {
    const page = await browser.newPage();
    await page.goto(`${appUrl}/results`);
    await page.waitForURL(/\/sign-in/);
    expect(await page.getByRole("heading", { name: "Sign in" }).isVisible()).toBe(true);
    await page.close();
  });

  it("gives a wrong password and an unknown e-mail the same answer", async () => {
    const page = await browser.newPage();
    const signIn = new SignInPage(page);
    await signIn.signIn("manager@fernbrook.example", "not-the-password");
    const wrongPassword = await signIn.errorMessage();
    await signIn.signIn("nobody@nowhere.example", "not-the-password");
    const unknownEmail = await signIn.errorMessage();
    expect(wrongPassword).toContain("do not match");
    expect(unknownEmail).toBe(wrongPassword);
    await screenshot(page, "sign-in-refused");
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await page.close();
  });

  it("fits a phone: the menu folds away behind a button", async () => {
    const phone = await openBrowser({ width: 390, height: 844 });
    try {
      const page = await phone.newPage();
      await new SignInPage(page).signIn("grower@fernbrook.example");
      const menuButton = page.getByRole("button", { name: "Menu" });
      await menuButton.waitFor();
      expect(await page.getByRole("navigation", { name: "Main" }).isVisible()).toBe(false);
      await menuButton.click();
      expect(await page.getByRole("link", { name: "Season logs" }).isVisible()).toBe(true);
      await screenshot(page, "phone-menu-grower");
    } finally {
      await phone.close();
    }
  });

  for (const member of roles) {
    it(`shows the ${member.role} their own menu, refuses ${member.forbidden}, and signs out`, async () => {
      const page = await browser.newPage();
      const errors = collectPageErrors(page);
      await new SignInPage(page).signIn(member.email);
      const shell = new AppShell(page);
      await shell.waitUntilSignedIn();
      expect(await shell.menuLabels()).toEqual(member.menu);
      await screenshot(page, `role-${member.role}`);
      expect(await seriousAccessibilityProblems(page)).toEqual([]);

      await page.goto(`${appUrl}${member.forbidden}`);
      await page.waitForURL(/\/forbidden/);
      expect(await page.getByRole("heading", { level: 1 }).textContent()).toContain("not open to your role");

      await page.goto(appUrl);
      await shell.waitUntilSignedIn();
      await shell.signOut();
      await page.goto(`${appUrl}/trials`);
      await page.waitForURL(/\/sign-in/);
      expect(errors).toEqual([]);
      await page.close();
    });
  }
});
