import { randomUUID } from "node:crypto";
import { z } from "zod";

/**
 * A message waiting in the job queue. Its one secret link (a one-time sign-in link, or a
 * reminders opt-out link) is not in it: the text holds a slot, and the mail job makes the link
 * and fills the slot just before sending, so no stored row ever holds a usable link.
 */
export const mailKinds = {
  invitation: "Invitation",
  "password-reset": "Password reset",
  "role-changed": "Role changed",
  "password-changed": "Password changed",
  "trial-invitation": "Trial invitation",
  "trial-enrolment": "Trial enrolment",
  "trial-reminder": "Trial reminder",
  "trial-results": "Trial results",
} as const;
export type MailKind = keyof typeof mailKinds;

export const secretLinkSchema = z.discriminatedUnion("for", [
  z.object({ for: z.literal("invitation"), tokenId: z.uuid() }),
  z.object({ for: z.literal("password-reset"), userId: z.uuid() }),
  z.object({ for: z.literal("reminders-opt-out"), enrolmentId: z.uuid() }),
]);
export type SecretLinkTarget = z.infer<typeof secretLinkSchema>;

export interface SecretLink {
  /** What the message's text says where the link will go; unique per message. */
  slot: string;
  target: SecretLinkTarget;
}

export const queuedMailSchema = z.object({
  mailId: z.uuid(),
  to: z.email(),
  subject: z.string(),
  text: z.string(),
  html: z.string(),
  link: z.object({ slot: z.string().regex(/^rhizomorph-link-[0-9a-f-]{36}$/), target: secretLinkSchema }).optional(),
});
export type QueuedMail = z.infer<typeof queuedMailSchema>;

/** A link for one message, to be made when it is sent. Pass `slot` to the message builder as the link. */
export function secretLink(target: SecretLinkTarget): SecretLink {
  return { slot: `rhizomorph-link-${randomUUID()}`, target };
}

const escapeHtml = (value: string) => value.replace(/[&<>"']/g, (character) => `&#${character.charCodeAt(0)};`);

/** The message as sent: the slot replaced by the link, HTML-escaped in the HTML part. */
export function withLink(mail: Pick<QueuedMail, "text" | "html">, slot: string, url: string): { text: string; html: string } {
  return { text: mail.text.replaceAll(slot, url), html: mail.html.replaceAll(slot, escapeHtml(url)) };
}
