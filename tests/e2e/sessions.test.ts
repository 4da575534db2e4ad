import { randomUUID } from "node:crypto";
import type { Pool } from "pg";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { superuserPool } from "../integration/support/database";
import { appUrl, openBrowser, screenshot } from "./support/browser";
import { AppShell, demoPassword, SignInPage } from "./support/pages";
import { startSecondServer } from "./support/second-server";
import { openedSignedIn, SettingsPage } from "./support/session-pages";

/**
 * Someone copies a member's session cookie (a shared computer, a browser profile synced to the
 * wrong place). Before sessions could end, the copy went on working for up to eight hours after
 * the member signed out or changed the password. Here it must stop at once, in this app process
 * and in a second one serving the same database.
 */

let inspector: Pool;
let second: { url: string; stop: () => void };
const made: string[] = [];

/** A member of their own, so ending their sessions touches no other test's demo sign-in. */
async function member(): Promise<string> {
  const email = `session-e2e-${randomUUID().slice(0, 8)}@aldervalley.example`;
  const { rows } = await inspector.query<{ id: string }>(
    `insert into users (email, name, role, password_hash)
     select $1, 'Session tester', 'observer', password_hash from users where email = 'observer@extension.example' returning id`,
    [email],
  );
  made.push(rows[0].id);
  return email;
}

/** A browser signed in as the member; its first page shows the app. */
async function signedInBrowser(email: string, password = demoPassword): Promise<BrowserContext> {
  const browser = await openBrowser();
  const page = browser.pages()[0] ?? (await browser.newPage());
  await new SignInPage(page).signIn(email, password);
  await new AppShell(page).waitUntilSignedIn();
  return browser;
}

/** Another browser holding a copy of the first one's cookies. */
async function copyOf(original: BrowserContext): Promise<BrowserContext> {
  const copy = await openBrowser();
  await copy.addCookies(await original.cookies());
  return copy;
}

beforeAll(async () => {
  inspector = superuserPool();
  second = await startSecondServer();
});

afterAll(async () => {
  second?.stop();
  await inspector.query("delete from users where id = any($1)", [made]);
  await inspector.end();
});

describe("a copied session cookie", () => {
  it("stops opening pages the moment the member signs out, here and in a second app process", async () => {
    const email = await member();
    const original = await signedInBrowser(email);
    const copy = await copyOf(original);
    try {
      const page = await copy.newPage();
      expect(await openedSignedIn(page, `${appUrl}/settings`)).toBe(true);
      expect(await openedSignedIn(page, `${second.url}/settings`)).toBe(true);

      await new AppShell(original.pages()[0]).signOut();

      expect(await openedSignedIn(page, `${appUrl}/settings`)).toBe(false);
      expect(await openedSignedIn(page, `${second.url}/settings`)).toBe(false);
      const api = await page.request.get(`${second.url}/api/results`, { failOnStatusCode: false });
      expect(api.status()).toBe(401);
    } finally {
      await original.close();
      await copy.close();
    }
  });

  it("stops, with every other browser's session, when the member signs out everywhere from Settings", async () => {
    const email = await member();
    const phone = await signedInBrowser(email);
    const laptop = await signedInBrowser(email);
    const copy = await copyOf(phone);
    try {
      const settings = new SettingsPage(laptop.pages()[0]);
      await settings.open();
      await screenshot(settings.page, "sessions-settings");
      await settings.signOutEverywhere();
      expect(await settings.page.getByRole("status").textContent()).toContain("signed out on every device");
      await screenshot(settings.page, "sessions-signed-out-everywhere");

      expect(await openedSignedIn(await phone.newPage(), `${appUrl}/results`)).toBe(false);
      expect(await openedSignedIn(await copy.newPage(), `${second.url}/results`)).toBe(false);
      expect(await openedSignedIn(laptop.pages()[0], `${appUrl}/results`)).toBe(false);
    } finally {
      await phone.close();
      await laptop.close();
      await copy.close();
    }
  });

  it("stops when the member changes the password, while the browser that changed it stays signed in", async () => {
    const email = await member();
    const laptop = await signedInBrowser(email);
    const copy = await copyOf(laptop);
    try {
      const settings = new SettingsPage(laptop.pages()[0]);
      await settings.open();
      expect(await settings.changePassword(demoPassword, "a-brand-new-password")).toContain("Every other device was signed out");
      expect(await openedSignedIn(laptop.pages()[0], `${appUrl}/settings`)).toBe(true);
      expect(await openedSignedIn(await copy.newPage(), `${appUrl}/settings`)).toBe(false);
      expect(await openedSignedIn(await copy.newPage(), `${second.url}/settings`)).toBe(false);
    } finally {
      await laptop.close();
      await copy.close();
    }
    const again = await signedInBrowser(email, "a-brand-new-password");
    await again.close();
  });
});
