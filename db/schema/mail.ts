import { bigserial, pgTable, text, timestamp } from "drizzle-orm/pg-core";

/** Messages caught by the local mail catcher, so the demo shows what would have been sent. */
export const mailMessages = pgTable("mail_messages", {
  id: bigserial("id", { mode: "number" }).primaryKey(),
  receivedAt: timestamp("received_at", { withTimezone: true }).notNull().defaultNow(),
  sender: text("sender").notNull(),
  recipients: text("recipients").array().notNull(),
  subject: text("subject").notNull().default(""),
  text: text("text").notNull().default(""),
  html: text("html").notNull().default(""),
});
