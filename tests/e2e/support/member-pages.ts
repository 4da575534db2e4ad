import type { Page } from "playwright-core";
import { appUrl } from "./browser";

async function outcome(page: Page, formTestId: string): Promise<string> {
  const message = page.locator(`form[data-testid="${formTestId}"] [role=status], form[data-testid="${formTestId}"] [role=alert]`);
  await message.first().waitFor();
  return (await message.first().textContent())?.trim() ?? "";
}

/** The coordinator's Members screen. */
export class MembersPage {
  constructor(readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.goto(`${appUrl}/members`);
    await this.page.getByRole("heading", { name: "Members", level: 1 }).waitFor();
  }

  async admitFarm(name: string, region: string, contactEmail: string): Promise<string> {
    const form = this.page.getByTestId("admit-farm");
    await form.getByLabel("Farm name").fill(name);
    await form.getByLabel("Region").fill(region);
    await form.getByLabel("Contact e-mail").fill(contactEmail);
    await form.getByRole("button", { name: "Admit farm" }).click();
    return outcome(this.page, "admit-farm");
  }

  async invite(email: string, roleLabel: string, farmName: string): Promise<string> {
    const form = this.page.getByTestId("invite-member");
    await form.getByLabel("Their e-mail").fill(email);
    await form.getByLabel("Role").selectOption({ label: roleLabel });
    await form.getByLabel("Farm (for a farm manager)").selectOption({ label: farmName });
    await form.getByRole("button", { name: "Send invitation" }).click();
    return outcome(this.page, "invite-member");
  }

  async farmNames(): Promise<string[]> {
    return this.page.getByRole("list", { name: "Member farms" }).locator("li p.font-semibold").allTextContents();
  }
}

/** The signed-out page a one-time invitation link opens. */
export class AcceptInvitationPage {
  constructor(readonly page: Page) {}

  async open(link: string): Promise<void> {
    // The e-mail carries the app's own address; keep only the path and token.
    const url = new URL(link);
    await this.page.goto(`${appUrl}${url.pathname}${url.search}`);
  }

  /** Fills in and sends the form; on success the app signs the new member in and opens their start page. */
  async accept(name: string, password: string): Promise<void> {
    const form = this.page.getByTestId("accept-invitation");
    await form.getByLabel("Your name").fill(name);
    await form.getByLabel("Password", { exact: true }).fill(password);
    await form.getByLabel("Password again").fill(password);
    await form.getByRole("button", { name: "Set password and join" }).click();
  }

  async refusal(): Promise<string> {
    const notice = this.page.locator("main [role=alert]");
    await notice.waitFor();
    return (await notice.textContent())?.trim() ?? "";
  }
}

/** A farm manager's Farm people screen. */
export class FarmPeoplePage {
  constructor(readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.goto(`${appUrl}/farm-people`);
    await this.page.getByRole("heading", { name: "Farm people", level: 1 }).waitFor();
  }

  async inviteGrower(email: string): Promise<string> {
    const form = this.page.getByTestId("invite-grower");
    await form.getByLabel("Their e-mail").fill(email);
    await form.getByRole("button", { name: "Send invitation" }).click();
    return outcome(this.page, "invite-grower");
  }

  async openInvitations(): Promise<string[]> {
    return this.page.getByRole("list", { name: "Open invitations" }).getByRole("listitem").allTextContents();
  }
}
