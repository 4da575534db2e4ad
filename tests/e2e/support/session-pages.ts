import type { Page } from "playwright-core";
import { appUrl } from "./browser";

/** The member's own Settings page: password and where they are signed in. */
export class SettingsPage {
  constructor(readonly page: Page) {}

  async open(base = appUrl): Promise<void> {
    await this.page.goto(`${base}/settings`);
    await this.page.getByRole("heading", { name: "Settings", level: 1 }).waitFor();
  }

  async signOutEverywhere(): Promise<void> {
    await this.page.getByTestId("sign-out-everywhere").getByRole("button", { name: "Sign out everywhere" }).click();
    await this.page.waitForURL(/\/sign-in\?signedOut=everywhere/);
  }

  async changePassword(current: string, next: string): Promise<string> {
    const form = this.page.getByTestId("change-password");
    await form.getByLabel("Current password").fill(current);
    await form.getByLabel("New password", { exact: true }).fill(next);
    await form.getByLabel("New password again").fill(next);
    await form.getByRole("button", { name: "Change password" }).click();
    const message = form.locator("[role=status], [role=alert]").first();
    await message.waitFor();
    return (await message.textContent())?.trim() ?? "";
  }
}

/** Whether a page of the app opens signed in, or sends the visitor to sign in. */
export async function openedSignedIn(page: Page, url: string): Promise<boolean> {
  await page.goto(url);
  await Promise.race([page.getByTestId("member-name").waitFor(), page.waitForURL(/\/sign-in/)]);
  return !/\/sign-in/.test(page.url());
}
