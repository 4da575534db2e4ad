import { index, integer, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { mailOutcome } from "./enums";

/**
 * What the app sent, for the coordinator: who, what kind, the subject, when, and how it went.
 * Never the body: a message may carry a one-time link, which exists only in the e-mail itself.
 */
export const outgoingMail = pgTable(
  "outgoing_mail",
  {
    id: uuid("id").primaryKey(),
    kind: text("kind").notNull(),
    recipient: text("recipient").notNull(),
    subject: text("subject").notNull(),
    queuedAt: timestamp("queued_at", { withTimezone: true }).notNull().defaultNow(),
    outcome: mailOutcome("outcome").notNull().default("queued"),
    attempts: integer("attempts").notNull().default(0),
    lastAttemptAt: timestamp("last_attempt_at", { withTimezone: true }),
    /** Why the last attempt failed, in a few words (the mail server's reply code, never the message). */
    problem: text("problem"),
  },
  (t) => [index("outgoing_mail_queued_idx").on(t.queuedAt)],
);
