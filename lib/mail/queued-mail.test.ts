import { describe, expect, it } from "vitest";
import { invitationMessage } from "./messages/members";
import { trialReminderMail } from "./messages/trials";
import { queuedMailSchema, secretLink, withLink } from "./queued-mail";

const tokenId = "0b9e8c0e-3f2a-4f7e-9d1c-2a4b6c8d0e1f";

describe("a queued message's secret link", () => {
  it("is a slot of its own per message, in the form the queue accepts", () => {
    const first = secretLink({ for: "invitation", tokenId });
    const second = secretLink({ for: "invitation", tokenId });
    expect(first.slot).not.toBe(second.slot);
    expect(
      queuedMailSchema.safeParse({ mailId: tokenId, to: "a@b.example", subject: "s", text: first.slot, html: "", link: first }).success,
    ).toBe(true);
    expect(
      queuedMailSchema.safeParse({ mailId: tokenId, to: "a@b.example", subject: "s", text: "", html: "", link: { ...first, slot: "x" } })
        .success,
    ).toBe(false);
  });

  it("keeps nothing but the message and the link's target: any other field is dropped", () => {
    const parsed = queuedMailSchema.parse({ mailId: tokenId, to: "a@b.example", subject: "s", text: "t", html: "h", token: "secret" });
    expect(parsed).not.toHaveProperty("token");
  });

  it("is filled into both parts when sent, escaped in the HTML, leaving no slot behind", () => {
    const link = secretLink({ for: "invitation", tokenId });
    const message = invitationMessage({
      to: "new@farm.example",
      inviterName: "Maren",
      role: "grower",
      farmName: "Fernbrook Farm",
      cooperativeName: "Alder Valley",
      link: link.slot,
      expiresAt: new Date("2026-12-09T00:00:00Z"),
    });
    expect(message.text).toContain(link.slot);
    expect(message.html).toContain(`href="${link.slot}"`);
    const url = 'https://app.example/accept-invitation?token=abc&x="1"';
    const sent = withLink(message, link.slot, url);
    expect(sent.text).toContain(`Accept the invitation: ${url}`);
    expect(sent.html).toContain('href="https://app.example/accept-invitation?token=abc&#38;x=&#34;1&#34;"');
    expect(`${sent.text}${sent.html}`).not.toContain(link.slot);
  });

  it("works for the trial e-mails' opt-out link too", () => {
    const link = secretLink({ for: "reminders-opt-out", enrolmentId: tokenId });
    const mail = trialReminderMail({
      trial: { code: "T-2026-03", title: "Winter oysters" },
      farmName: "Fernbrook Farm",
      due: [],
      progressUrl: "https://app.example/trials/1",
      optOutUrl: link.slot,
    });
    const sent = withLink(mail, link.slot, "https://app.example/unsubscribe/abc.def");
    expect(sent.text).toContain("To stop reminders about this trial for your farm: https://app.example/unsubscribe/abc.def");
    expect(sent.html).toContain('href="https://app.example/unsubscribe/abc.def"');
  });
});
