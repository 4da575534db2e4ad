import { vi } from "vitest";

/**
 * The local mail server's inbox, read through maildev's REST API (GET /email), the way a person
 * reads the web inbox: this is where a link can be found, and only here. The test script starts
 * maildev and exports its address as MAIL_INBOX_URL.
 */
export interface ReceivedMail {
  id: string;
  subject: string;
  text: string;
  html: string;
  to: string[];
  date: string;
}

function inboxUrl(): string {
  const url = process.env.MAIL_INBOX_URL;
  if (!url) throw new Error("MAIL_INBOX_URL is not set: run the tests through npm test");
  return url.replace(/\/+$/, "");
}

interface MaildevMail {
  id: string;
  subject?: string;
  text?: string;
  html?: string;
  to?: { address: string }[];
  date: string;
}

/** Every message in the inbox, oldest first. */
export async function inbox(): Promise<ReceivedMail[]> {
  const response = await fetch(`${inboxUrl()}/email`);
  if (!response.ok) throw new Error(`maildev answered ${response.status}`);
  const mails = (await response.json()) as MaildevMail[];
  return mails.map((mail) => ({
    id: mail.id,
    subject: mail.subject ?? "",
    text: mail.text ?? "",
    html: mail.html ?? "",
    to: (mail.to ?? []).map((recipient) => recipient.address.toLowerCase()),
    date: mail.date,
  }));
}

/** The messages to one address whose subject matches, oldest first. */
export async function mailsTo(to: string, subject: RegExp = /./): Promise<ReceivedMail[]> {
  return (await inbox()).filter((mail) => mail.to.includes(to.toLowerCase()) && subject.test(mail.subject));
}

/** The newest message to `to` matching `subject`, waiting (up to `timeout` ms) until there are at least `count` of them. */
export async function mailTo(to: string, subject: RegExp, { count = 1, timeout = 10_000 } = {}): Promise<ReceivedMail> {
  return vi.waitFor(
    async () => {
      const found = await mailsTo(to, subject);
      if (found.length < count) throw new Error(`${found.length} e-mail(s) to ${to} matching ${subject}, waiting for ${count}`);
      return found[found.length - 1];
    },
    { timeout, interval: 100 },
  );
}

/** The one-time token in a message's link to the accept or reset page. */
export function tokenIn(text: string, page: "accept-invitation" | "reset-password"): string {
  const match = text.match(new RegExp(`/${page}\\?token=([A-Za-z0-9_-]{43})`));
  if (!match) throw new Error(`no ${page} link in:\n${text}`);
  return match[1];
}

/**
 * Runs `work` in this process with the mail server unreachable (nothing listens on port 1, so
 * every connection is refused at once). lib/mail/send.ts builds its SMTP transport once per
 * process, so it is dropped before and after.
 */
export async function withMailServerDown<T>(work: () => Promise<T>): Promise<T> {
  const mailer = globalThis as { rhizomorphMailer?: unknown };
  const before = process.env.SMTP_PORT;
  process.env.SMTP_PORT = "1";
  mailer.rhizomorphMailer = undefined;
  try {
    return await work();
  } finally {
    process.env.SMTP_PORT = before;
    mailer.rhizomorphMailer = undefined;
  }
}
