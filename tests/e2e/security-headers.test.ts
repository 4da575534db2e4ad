import type { Pool } from "pg";
import { request, type BrowserContext, type Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { superuserPool } from "../integration/support/database";
import { appUrl, openBrowser, screenshot } from "./support/browser";
import { AppShell, SignInPage } from "./support/pages";

/**
 * Every page as every role, in Chromium, with the Content Security Policy enforced: no page may
 * trip it (a violation means a script or style the policy would block, or an injection it did
 * block), every page must still come alive (hydrate), and every response carries the headers.
 */

const roles = [
  { role: "coordinator", email: "coordinator@aldervalley.example" },
  { role: "farm manager", email: "manager@fernbrook.example" },
  { role: "grower", email: "grower@fernbrook.example" },
  { role: "observer", email: "observer@extension.example" },
];

let inspector: Pool;
let browser: BrowserContext;
let pagesByRole: Record<string, string[]>;
let publicPages: string[];

/** Records every violation the page reports, from before its first script runs. */
const recordViolations = () => {
  const seen: string[] = [];
  (window as unknown as { cspViolations: string[] }).cspViolations = seen;
  document.addEventListener("securitypolicyviolation", (event) => {
    seen.push(
      `${event.violatedDirective} blocked ${event.blockedURI || `inline "${event.sample}"`} at ${event.sourceFile}:${event.lineNumber}`,
    );
  });
};

function expectSecurityHeaders(response: { headers(): Record<string, string> }, what: string, page = true) {
  const headers = response.headers();
  const policy = headers["content-security-policy"] ?? "";
  expect(policy, what).toContain("frame-ancestors 'none'");
  if (page) {
    expect(policy, what).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]+' 'strict-dynamic'/);
    expect(policy, what).toContain("object-src 'none'");
    expect(policy, what).not.toContain("unsafe-inline");
    expect(policy, what).not.toContain("unsafe-eval");
  } else {
    expect(policy, what).toContain("default-src 'none'");
  }
  expect(headers["x-content-type-options"], what).toBe("nosniff");
  expect(headers["referrer-policy"], what).toBe("strict-origin-when-cross-origin");
  expect(headers["permissions-policy"], what).toContain("camera=()");
  expect(headers["permissions-policy"], what).toContain("geolocation=()");
  expect(headers["x-frame-options"], what).toBe("DENY");
}

/** Opens a page, waits for it to settle (charts draw after hydration) and returns what the policy reported. */
async function visit(page: Page, path: string): Promise<{ violations: string[]; consoleErrors: string[] }> {
  const consoleErrors: string[] = [];
  const listener = (message: { type(): string; text(): string }) => {
    if (message.type() === "error") consoleErrors.push(message.text());
  };
  page.on("console", listener);
  const response = await page.goto(`${appUrl}${path}`, { waitUntil: "networkidle" });
  expect(response, path).not.toBeNull();
  expectSecurityHeaders(response!, path);
  // Hydrated: React has attached to the page (a framework script ran under the policy).
  await page.waitForFunction(() => "next" in window);
  const violations = await page.evaluate(() => (window as unknown as { cspViolations: string[] }).cspViolations ?? []);
  page.off("console", listener);
  return { violations, consoleErrors: consoleErrors.filter((text) => /Content Security Policy|Refused to/.test(text)) };
}

/** Clicks every menu link in turn, then each detail page's link from the page above it; returns what the policy reported. */
async function clickThrough(page: Page, menu: string[], details: string[]): Promise<string[]> {
  const consoleErrors: string[] = [];
  const listener = (message: { type(): string; text(): string }) => {
    if (message.type() === "error" && /Content Security Policy|Refused to/.test(message.text())) consoleErrors.push(message.text());
  };
  page.on("console", listener);
  const problems: string[] = [];
  const collect = async (where: string) => {
    const violations = await page.evaluate(() => (window as unknown as { cspViolations: string[] }).cspViolations.splice(0));
    problems.push(...[...violations, ...consoleErrors.splice(0)].map((problem) => `${where} (clicked): ${problem}`));
  };
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
  page.off("console", listener);
  return problems;
}

beforeAll(async () => {
  inspector = superuserPool();
  browser = await openBrowser();
  await browser.addInitScript(recordViolations);
  const one = async (query: string, values: unknown[] = []) => (await inspector.query<{ id: string }>(query, values)).rows[0].id;
  const fernbrook = await one("select id from farms where name = 'Fernbrook Farm'");
  const block = await one("select id from blocks where farm_id = $1 order by code limit 1", [fernbrook]);
  const published = await one("select id from trials where status = 'published' order by code limit 1");
  const draft = (await inspector.query<{ id: string }>("select id from trials where status = 'draft' order by code limit 1")).rows[0]?.id;
  const enrolment = await one("select id from trial_enrolments where farm_id = $1 order by id limit 1", [fernbrook]);
  const { signOptOutToken } = await import("@/lib/trials/reminder-opt-out");
  const detail = {
    farm: [
      "/blocks/harvest",
      `/blocks/${block}`,
      "/season-logs/columns",
      `/trials/${published}`,
      `/trials/${published}/results`,
      `/trials/${published}/labels`,
    ],
    coordinator: ["/trials/new", `/trials/${published}`, `/trials/${published}/results`, ...(draft ? [`/trials/${draft}/edit`] : [])],
    observer: [`/trials/${published}`, `/trials/${published}/results`],
  };
  pagesByRole = {
    coordinator: detail.coordinator,
    "farm manager": [...detail.farm, "/farm-people/data"],
    grower: detail.farm,
    observer: detail.observer,
  };
  publicPages = [
    "/sign-in",
    "/reset-password",
    "/accept-invitation?token=not-a-real-token",
    "/cautions",
    "/forbidden",
    `/unsubscribe/${encodeURIComponent(signOptOutToken(enrolment, process.env.AUTH_SECRET ?? ""))}`,
    "/no-such-page",
  ];
});

afterAll(async () => {
  await browser?.close();
  await inspector?.end();
});

describe("the Content Security Policy and security headers", () => {
  it("hold on every public page: no violation, headers on each", async () => {
    await browser.clearCookies();
    const page = browser.pages()[0] ?? (await browser.newPage());
    const problems: string[] = [];
    for (const path of publicPages) {
      const { violations, consoleErrors } = await visit(page, path);
      problems.push(...[...violations, ...consoleErrors].map((problem) => `${path}: ${problem}`));
    }
    expect(problems).toEqual([]);
  });

  for (const { role, email } of roles) {
    it(`hold on every page the ${role} can open: the menu's pages and the detail pages`, async () => {
      await browser.clearCookies();
      const page = browser.pages()[0] ?? (await browser.newPage());
      await new SignInPage(page).signIn(email);
      await new AppShell(page).waitUntilSignedIn();
      const menu = await page
        .getByRole("navigation", { name: "Main" })
        .locator("a[href^='/']")
        .evaluateAll((links) => links.map((link) => link.getAttribute("href")!));
      expect(menu.length).toBeGreaterThan(2);
      const problems: string[] = [];
      for (const path of [...new Set([...menu, ...pagesByRole[role]])]) {
        const { violations, consoleErrors } = await visit(page, path);
        problems.push(...[...violations, ...consoleErrors].map((problem) => `${path}: ${problem}`));
      }
      // The same pages reached by clicking, as people do: the browser renders them itself then,
      // under the nonce of the page it started from.
      problems.push(...(await clickThrough(page, menu, pagesByRole[role])));
      await screenshot(page, `csp-${role.replace(" ", "-")}`);
      expect(problems).toEqual([]);
    });
  }

  it("block an injected inline script, and say so (the policy is enforced, not only sent)", async () => {
    const page = browser.pages()[0] ?? (await browser.newPage());
    await page.goto(`${appUrl}/sign-in`, { waitUntil: "networkidle" });
    // What an injection into the markup would add: an inline event handler.
    const ran = await page.evaluate(
      () =>
        new Promise<boolean>((resolve) => {
          document.body.insertAdjacentHTML("beforeend", '<img id="injected" src="/no-such-image.png" onerror="window.injectedRan = true">');
          document
            .getElementById("injected")!
            .addEventListener("error", () =>
              setTimeout(() => resolve((window as unknown as { injectedRan?: boolean }).injectedRan === true), 50),
            );
        }),
    );
    expect(ran).toBe(false);
    const violations = await page.evaluate(() => (window as unknown as { cspViolations: string[] }).cspViolations);
    expect(violations.some((violation) => violation.startsWith("script-src"))).toBe(true);
  });

  it("come with API answers and static files too", async () => {
    const page = browser.pages()[0] ?? (await browser.newPage());
    const api = await page.request.get(`${appUrl}/api/results`, { failOnStatusCode: false });
    expectSecurityHeaders(api, "GET /api/results", false);
    const icon = await page.request.get(`${appUrl}/icon.svg`);
    expectSecurityHeaders(icon, "GET /icon.svg", false);
    const html = await (await page.request.get(`${appUrl}/sign-in`)).text();
    const script = /<script src="([^"]+\.js)"/.exec(html)?.[1];
    expect(script).toBeDefined();
    expectSecurityHeaders(await page.request.get(`${appUrl}${script}`), script!, false);
  });

  it("let the installable app's files through without a session, the offline worker under its own policy", async () => {
    // A browser fetches the manifest without cookies; a redirect to sign in would make the app uninstallable.
    const anonymous = await request.newContext();
    try {
      const manifest = await anonymous.get(`${appUrl}/manifest.webmanifest`, { maxRedirects: 0 });
      expect(manifest.status()).toBe(200);
      expect(((await manifest.json()) as { start_url?: string }).start_url).toBe("/blocks/harvest");
      expectSecurityHeaders(manifest, "GET /manifest.webmanifest", false);
      const icon = await anonymous.get(`${appUrl}/icons/icon-192.png`, { maxRedirects: 0 });
      expect(icon.status()).toBe(200);
      expectSecurityHeaders(icon, "GET /icons/icon-192.png", false);
      const worker = await anonymous.get(`${appUrl}/sw.js`, { maxRedirects: 0 });
      expect(worker.status()).toBe(200);
      const policy = worker.headers()["content-security-policy"] ?? "";
      expect(policy).toContain("default-src 'self'");
      expect(policy).toContain("frame-ancestors 'none'");
      expect(worker.headers()["x-content-type-options"]).toBe("nosniff");
    } finally {
      await anonymous.dispose();
    }
  });
});
