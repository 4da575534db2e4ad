import "server-only";
import { randomUUID } from "node:crypto";
import { desc, sql } from "drizzle-orm";
import { z } from "zod";
import { type Transaction } from "@/db/client";
import { outgoingMail } from "@/db/schema";
import { appUrl } from "@/lib/app-url";
import { enqueue } from "@/lib/jobs/queue";
import { accessLink, newAccessToken } from "@/lib/members/tokens";
import { signOptOutToken } from "@/lib/trials/reminder-opt-out";
import { withLink, type MailKind, type QueuedMail, type SecretLink, type SecretLinkTarget } from "@/lib/mail/queued-mail";
import { sendMail, type OutgoingMessage } from "@/lib/mail/send";
import { env } from "@/lib/env";
import { asMember, asNobody } from "./context";
import type { Member } from "./members";

export { secretLink } from "@/lib/mail/queued-mail";

/**
 * Every e-mail the app sends starts here, inside the transaction of the change that causes it:
 * a record for the coordinator (no body) and a "send-mail" job, which runs after the commit. A
 * message with a secret link is built with `link.slot` where the link goes; the job makes the
 * link when it sends (see sendQueuedMail).
 */
export async function queueMail(tx: Transaction, kind: MailKind, message: OutgoingMessage, link?: SecretLink): Promise<void> {
  if (link && !message.text.includes(link.slot)) throw new Error(`The ${kind} message does not show its link`);
  const mailId = randomUUID();
  await tx.insert(outgoingMail).values({ id: mailId, kind, recipient: message.to, subject: message.subject });
  await enqueue(tx, "send-mail", { mailId, ...message, link });
}

export interface Attempt {
  retryCount: number;
  retryLimit: number;
}

/**
 * The "send-mail" job. Makes the message's link (a one-time link gets a fresh token whose hash
 * replaces the one before, so only the newest e-mail's link works; an invitation cancelled or a
 * reset used meanwhile is not sent at all), sends, and records the outcome. A failure is
 * recorded as "retrying" while attempts remain, then "failed", and thrown so pg-boss retries.
 */
export async function sendQueuedMail(mail: QueuedMail, attempt: Attempt): Promise<void> {
  let message: OutgoingMessage = { to: mail.to, subject: mail.subject, text: mail.text, html: mail.html };
  if (mail.link) {
    const url = await makeLink(mail.link.target, mail.to).catch((error: unknown) => {
      if (error instanceof LinkForAnotherAddress) return error;
      throw error;
    });
    if (url instanceof LinkForAnotherAddress) {
      await recordOutcome(mail.mailId, "failed", "Not sent: its link belongs to another address.");
      return;
    }
    if (!url) {
      await recordOutcome(mail.mailId, "cancelled", "Not sent: the link was cancelled, used or expired before it went out.");
      return;
    }
    message = { ...message, ...withLink(mail, mail.link.slot, url) };
  }
  try {
    await sendMail(message);
  } catch (error) {
    await recordOutcome(mail.mailId, attempt.retryCount < attempt.retryLimit ? "retrying" : "failed", problemOf(error));
    throw error;
  }
  await recordOutcome(mail.mailId, "sent", null);
}

/** A message whose one-time link is for someone else (a forged or mistaken job): never sent, never retried. */
class LinkForAnotherAddress extends Error {}

async function makeLink(target: SecretLinkTarget, to: string): Promise<string | null> {
  if (target.for === "reminders-opt-out") {
    return `${appUrl()}/unsubscribe/${signOptOutToken(target.enrolmentId, env("AUTH_SECRET"))}`;
  }
  const { token, tokenHash } = newAccessToken();
  const issued = await asNobody(async (tx) => {
    const result = await tx.execute<{ email: string }>(
      target.for === "invitation"
        ? sql`select email from app_issue_invitation_link(${target.tokenId}::uuid, ${tokenHash})`
        : sql`select email from app_issue_password_reset_link(${target.userId}::uuid, ${tokenHash})`,
    );
    const row = result.rows[0];
    // Thrown inside the transaction, so the new hash is rolled back: a link only ever goes to the address it was made for.
    if (row && row.email.toLowerCase() !== to.toLowerCase()) throw new LinkForAnotherAddress(`A ${target.for} link is not for ${to}`);
    return Boolean(row);
  });
  return issued ? accessLink(appUrl(), target.for === "invitation" ? "invitation" : "password_reset", token) : null;
}

async function recordOutcome(mailId: string, outcome: "sent" | "retrying" | "failed" | "cancelled", problem: string | null) {
  await asNobody((tx) => tx.execute(sql`select app_record_mail_outcome(${mailId}::uuid, ${outcome}, ${problem})`));
}

/** What nodemailer's error carries; a field of another type is read as missing. */
const sendFailure = z.object({
  code: z.string().optional().catch(undefined),
  responseCode: z.number().optional().catch(undefined),
  message: z.string().optional().catch(undefined),
});

/** A few words on why sending failed, from nodemailer's error code and the server's reply code only (never the reply's text). */
function problemOf(error: unknown): string {
  const { code, responseCode, message } = sendFailure.safeParse(error).data ?? {};
  if (message !== undefined && /\b(ECONNREFUSED|ENOTFOUND|EHOSTUNREACH|ENETUNREACH)\b/.test(message))
    return "could not reach the mail server";
  const reasons: Record<string, string> = {
    ECONNECTION: "could not reach the mail server",
    ETIMEDOUT: "the mail server did not answer in time",
    ESOCKET: "the connection to the mail server broke",
    EAUTH: "the mail server refused the app's sign-in",
    EENVELOPE: "the mail server refused the address",
    EMESSAGE: "the mail server refused the message",
  };
  const said = code !== undefined ? (reasons[code] ?? code) : "sending failed";
  return responseCode !== undefined ? `${said} (reply ${responseCode})` : said;
}

export type OutgoingMailRecord = Pick<
  typeof outgoingMail.$inferSelect,
  "id" | "kind" | "recipient" | "subject" | "queuedAt" | "outcome" | "attempts" | "lastAttemptAt" | "problem"
>;

/** The coordinator's record of what went out, newest first (row-level security: the coordinator only). */
export async function listOutgoingMail(member: Member, limit = 200): Promise<OutgoingMailRecord[]> {
  return asMember(member, (tx) =>
    tx
      .select({
        id: outgoingMail.id,
        kind: outgoingMail.kind,
        recipient: outgoingMail.recipient,
        subject: outgoingMail.subject,
        queuedAt: outgoingMail.queuedAt,
        outcome: outgoingMail.outcome,
        attempts: outgoingMail.attempts,
        lastAttemptAt: outgoingMail.lastAttemptAt,
        problem: outgoingMail.problem,
      })
      .from(outgoingMail)
      .orderBy(desc(outgoingMail.queuedAt))
      .limit(limit),
  );
}
