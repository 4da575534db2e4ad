import { formatDateTime, utcDisplay, type TimeDisplay } from "@/lib/time/display";
import type { OutgoingMessage } from "../send";

const roleWords: Record<string, string> = {
  coordinator: "co-op coordinator",
  farm_manager: "farm manager",
  grower: "grower",
  observer: "observer",
};

function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (character) => `&#${character.charCodeAt(0)};`);
}

function message(to: string, subject: string, paragraphs: string[], link?: { href: string; label: string }): OutgoingMessage {
  const text = [...paragraphs, ...(link ? [`${link.label}: ${link.href}`] : []), "— Rhizomorph, for your growers' co-op"].join("\n\n");
  const html = [
    ...paragraphs.map((paragraph) => `<p>${escapeHtml(paragraph)}</p>`),
    ...(link ? [`<p><a href="${escapeHtml(link.href)}">${escapeHtml(link.label)}</a></p><p>${escapeHtml(link.href)}</p>`] : []),
    "<p>— Rhizomorph, for your growers' co-op</p>",
  ].join("\n");
  return { to, subject, text, html };
}

export function invitationMessage(input: {
  to: string;
  inviterName: string;
  role: string;
  farmName: string | null;
  cooperativeName: string;
  link: string;
  expiresAt: Date;
}): OutgoingMessage {
  const where = input.farmName ? `${input.farmName} in ${input.cooperativeName}` : input.cooperativeName;
  return message(
    input.to,
    `You are invited to ${where} on Rhizomorph`,
    [
      `${input.inviterName} has invited you to join ${where} as ${roleWords[input.role] ?? input.role}.`,
      `Open the link below to choose your password. It works once and until ${formatDateTime(input.expiresAt, utcDisplay)}.`,
      "If you did not expect this, ignore this message; nothing happens unless the link is opened.",
    ],
    { href: input.link, label: "Accept the invitation" },
  );
}

/** `display`: the member's own zone and date style when they chose one, else UTC (named as such). */
export function passwordResetMessage(input: {
  to: string;
  name: string;
  link: string;
  expiresAt: Date;
  display: TimeDisplay;
}): OutgoingMessage {
  return message(
    input.to,
    "Reset your Rhizomorph password",
    [
      `Hello ${input.name},`,
      `Someone asked to reset the password for this address. Open the link below to choose a new one. It works once and until ${formatDateTime(input.expiresAt, input.display)}.`,
      "If it was not you, ignore this message: your password stays as it is.",
    ],
    { href: input.link, label: "Choose a new password" },
  );
}

export function roleChangedMessage(input: {
  to: string;
  name: string;
  oldRole: string;
  newRole: string;
  changedBy: string;
  farmName: string | null;
}): OutgoingMessage {
  return message(input.to, "Your role on Rhizomorph has changed", [
    `Hello ${input.name},`,
    `${input.changedBy} changed your role${input.farmName ? ` at ${input.farmName}` : ""} from ${roleWords[input.oldRole] ?? input.oldRole} to ${roleWords[input.newRole] ?? input.newRole}.`,
    "Your menu changes the next time you open a page. If this looks wrong, reply to your coordinator.",
  ]);
}

export function passwordChangedMessage(input: { to: string; name: string }): OutgoingMessage {
  return message(input.to, "Your Rhizomorph password was changed", [
    `Hello ${input.name},`,
    "The password for this address was just changed. If that was not you, reset it from the sign-in page now and tell your coordinator.",
  ]);
}
