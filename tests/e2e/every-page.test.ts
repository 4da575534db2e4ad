import type { Pool } from "pg";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signOptOutToken } from "@/lib/trials/reminder-opt-out";
import { superuserPool } from "../integration/support/database";
import { appUrl, openBrowser, pageLayoutProblems, pageWidths, screenshot } from "./support/browser";
import { menuOf, pageList, rolesToVisit, screenshotName, type PageList } from "./support/page-list";
import { AppShell, SignInPage } from "./support/pages";
import { expectSecurityHeaders, recordViolations } from "./support/security";

/**
 * Every page as every role (tests/e2e/support/page-list.ts), in Chromium, at 1366 and 390 px:
 * the Content Security Policy holds (no violation: a violation means a script or style the policy
 * would block, or an injection it did block) and every response carries the headers; every page
 * comes alive (hydrates); axe-core finds nothing of any impact; no id is used twice; nothing makes
 * the page wider than the window. A screenshot of each page at each width goes to test-results.
 */

let inspector: Pool;
let pages: PageList;
const browsers: BrowserContext[] = [];

/** A browser of its own for each role, so the roles' tours run side by side (most of a visit is waiting for the network to settle). */
async function ownBrowser(): Promise<Page> {
  const browser = await openBrowser();
  browsers.push(browser);
  await browser.addInitScript(recordViolations);
  return browser.pages()[0] ?? (await browser.newPage());
}

/** What the page's console says about the Content Security Policy, until `stop` is called. */
function policyConsoleErrors(page: Page): { consoleErrors: string[]; stop: () => void } {
  const consoleErrors: string[] = [];
  const listener = (message: { type(): string; text(): string }) => {
    if (message.type() === "error" && /Content Security Policy|Refused to/.test(message.text())) consoleErrors.push(message.text());
  };
  page.on("console", listener);
  return { consoleErrors, stop: () => page.off("console", listener) };
}

/** Opens a page, checks it at both widths and returns what was wrong, each problem prefixed with the address. */
async function visit(page: Page, role: string, path: string): Promise<string[]> {
  const { consoleErrors, stop } = policyConsoleErrors(page);
  await page.setViewportSize({ width: 1366, height: 900 });
  const response = await page.goto(`${appUrl}${path}`, { waitUntil: "networkidle" });
  expect(response, path).not.toBeNull();
  expectSecurityHeaders(response!, path);
  // Hydrated: React has attached to the page (a framework script ran under the policy).
  await page.waitForFunction(() => "next" in window);
  const problems = await page.evaluate(() => (window as unknown as { cspViolations: string[] }).cspViolations.splice(0));
  for (const width of [...pageWidths].reverse()) {
    await page.setViewportSize({ width, height: width < 600 ? 844 : 900 });
    // Charts measure their frame when it resizes and draw again a frame or two later.
    await page.evaluate(() => new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(() => setTimeout(resolve, 150)))));
    // axe once per page, at the wide layout: the narrow one has the same markup.
    problems.push(...(await pageLayoutProblems(page, { axe: width !== pageWidths[0] })).map((problem) => `${width}px: ${problem}`));
    await screenshot(page, screenshotName(role, path, width));
  }
  stop();
  return [...problems, ...consoleErrors].map((problem) => `${path}: ${problem}`);
}

/** Clicks every menu link in turn, then each detail page's link from the page above it; returns what the policy reported. */
async function clickThrough(page: Page, menu: string[], details: string[]): Promise<string[]> {
  const { consoleErrors, stop } = policyConsoleErrors(page);
  const problems: string[] = [];
  const collect = async (where: string) => {
    const violations = await page.evaluate(() => (window as unknown as { cspViolations: string[] }).cspViolations.splice(0));
    problems.push(...[...violations, ...consoleErrors.splice(0)].map((problem) => `${where} (clicked): ${problem}`));
  };
  await page.setViewportSize({ width: 1366, height: 900 });
  await page.goto(`${appUrl}${menu[0]}`, { waitUntil: "networkidle" });
  for (const href of menu.slice(1)) {
    await page.getByRole("navigation", { name: "Main" }).locator(`a[href="${href}"]`).click();
    await page.waitForURL((url) => url.pathname === href);
    await page.waitForLoadState("networkidle");
    await collect(href);
  }
  for (const path of details) {
    const above = path.replace(/\/[^/]+$/, "") || "/";
    await page.goto(`${appUrl}${above}`, { waitUntil: "networkidle" });
    const link = page.locator(`main a[href="${path}"]`).first();
    if ((await link.count()) === 0) continue;
    await link.click();
    await page.waitForURL((url) => url.pathname === path);
    await page.waitForLoadState("networkidle");
    await collect(path);
  }
  stop();
  return problems;
}

beforeAll(async () => {
  inspector = superuserPool();
  pages = await pageList(
    inspector,
    (enrolment) => `/unsubscribe/${encodeURIComponent(signOptOutToken(enrolment, process.env.AUTH_SECRET ?? ""))}`,
  );
});

afterAll(async () => {
  await Promise.all(browsers.map((browser) => browser.close()));
  await inspector?.end();
});

// Concurrent: the e2e project's maxConcurrency bounds how many tours run at once on a 2-core machine.
describe.concurrent("every page, as every role, at 390 and 1366 px", () => {
  it("holds when signed out: the policy, the headers, axe, ids and width", { timeout: 360_000 }, async () => {
    const page = await ownBrowser();
    const problems: string[] = [];
    for (const path of pages.publicPages) problems.push(...(await visit(page, "signed-out", path)));
    expect(problems).toEqual([]);
  });

  for (const { role, email } of rolesToVisit) {
    // Each page twice (two widths, axe once): minutes, not seconds, for a role with many pages.
    it(`holds for the ${role}: the menu's pages and the detail pages, opened and clicked`, { timeout: 360_000 }, async () => {
      const page = await ownBrowser();
      await page.setViewportSize({ width: 1366, height: 900 });
      await new SignInPage(page).signIn(email);
      await new AppShell(page).waitUntilSignedIn();
      const menu = await menuOf(page);
      expect(menu.length).toBeGreaterThan(2);
      const problems: string[] = [];
      for (const path of [...new Set([...menu, ...pages.detailPages[role]])]) problems.push(...(await visit(page, role, path)));
      // The same pages reached by clicking, as people do: the browser renders them itself then,
      // under the nonce of the page it started from.
      problems.push(...(await clickThrough(page, menu, pages.detailPages[role])));
      expect(problems).toEqual([]);
    });
  }
});
