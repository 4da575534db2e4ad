import { expect } from "vitest";
import type { Page } from "playwright-core";
import { appUrl } from "./browser";

export const demoPassword = "alder-valley-demo";

/** The sign-in page, as a person uses it. */
export class SignInPage {
  /** `base`: another app process of the same build, where a test starts one. */
  constructor(
    readonly page: Page,
    readonly base = appUrl,
  ) {}

  async open(): Promise<void> {
    await this.page.goto(`${this.base}/sign-in`);
  }

  async signIn(email: string, password = demoPassword): Promise<void> {
    await this.open();
    await this.page.getByLabel("E-mail").fill(email);
    await this.page.getByLabel("Password").fill(password);
    await this.page.getByRole("button", { name: "Sign in" }).click();
  }

  /** The form's own alert (Next.js keeps an empty one of its own for route announcements). */
  async errorMessage(): Promise<string> {
    const alert = this.page.locator("form [role=alert]");
    await alert.waitFor();
    return (await alert.textContent())?.trim() ?? "";
  }
}

/** The signed-in shell: its menu and the sign-out button. */
export class AppShell {
  constructor(readonly page: Page) {}

  /** Signed in, and the landing page's own heading is there (the shell can show before the page streams in). */
  async waitUntilSignedIn(): Promise<void> {
    await this.page.getByTestId("member-name").waitFor();
    await this.page.getByRole("main").getByRole("heading", { level: 1 }).first().waitFor();
  }

  async menuLabels(): Promise<string[]> {
    const links = this.page.getByRole("navigation", { name: "Main" }).getByRole("listitem");
    return (await links.allTextContents()).map((text) => text.trim());
  }

  async signOut(): Promise<void> {
    await this.page.getByRole("button", { name: "Sign out" }).click();
    await this.page.waitForURL(/\/sign-in/);
    expect(await this.page.getByRole("status").textContent()).toContain("signed out");
  }
}
