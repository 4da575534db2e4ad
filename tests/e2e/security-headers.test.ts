import { request, type BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { appUrl, openBrowser } from "./support/browser";
import { expectSecurityHeaders, recordViolations } from "./support/security";

/**
 * The Content Security Policy is enforced, not only sent, and API answers and static files carry
 * the headers too. Every page's own policy and headers are checked in every-page.test.ts.
 */

let browser: BrowserContext;

beforeAll(async () => {
  browser = await openBrowser();
  await browser.addInitScript(recordViolations);
});

afterAll(async () => {
  await browser?.close();
});

describe("the Content Security Policy and security headers", () => {
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
