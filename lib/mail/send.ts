import "server-only";
import nodemailer, { type Transporter } from "nodemailer";
import { env } from "@/lib/env";

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
  const user = env("SMTP_USER");
  globalForMail.rhizomorphMailer ??= nodemailer.createTransport({
    host: env("SMTP_HOST"),
    port: env("SMTP_PORT"),
    secure: env("SMTP_SECURE") === "true",
    auth: user ? { user, pass: env("SMTP_PASSWORD") ?? "" } : undefined,
    ignoreTLS: env("SMTP_SECURE") !== "true" && !user,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  });
  return globalForMail.rhizomorphMailer;
}

/** Speaks SMTP to the mail server. Only the mail job calls this (lib/data/mail.ts). */
export async function sendMail(message: OutgoingMessage): Promise<void> {
  await mailer().sendMail({
    from: env("MAIL_FROM"),
    to: message.to,
    subject: message.subject,
    text: message.text,
    html: message.html,
  });
}
