import "server-only";
import nodemailer, { type Transporter } from "nodemailer";

export interface OutgoingMessage {
  to: string;
  subject: string;
  text: string;
  html: string;
}

const globalForMail = globalThis as unknown as { rhizomorphMailer?: Transporter };

// SMTP settings come from the environment: the local maildev in development and tests, the
// co-op's own mail service in production. Short timeouts: a mail job that cannot reach the
// server fails and is retried later rather than holding its worker.
function mailer(): Transporter {
  globalForMail.rhizomorphMailer ??= nodemailer.createTransport({
    host: process.env.SMTP_HOST ?? "127.0.0.1",
    port: Number(process.env.SMTP_PORT ?? 2525),
    secure: process.env.SMTP_SECURE === "true",
    auth: process.env.SMTP_USER ? { user: process.env.SMTP_USER, pass: process.env.SMTP_PASSWORD ?? "" } : undefined,
    ignoreTLS: process.env.SMTP_SECURE !== "true" && !process.env.SMTP_USER,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  });
  return globalForMail.rhizomorphMailer;
}

/** Speaks SMTP to the mail server. Only the mail job calls this (lib/data/mail.ts). */
export async function sendMail(message: OutgoingMessage): Promise<void> {
  await mailer().sendMail({
    from: process.env.MAIL_FROM ?? "Rhizomorph <no-reply@rhizomorph.invalid>",
    to: message.to,
    subject: message.subject,
    text: message.text,
    html: message.html,
  });
}
