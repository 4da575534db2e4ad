/** Where a message the app sends stands (db enum mail_outcome), in the order it moves through them. */
export const mailOutcomes = ["queued", "sent", "retrying", "failed", "cancelled"] as const;
export type MailOutcome = (typeof mailOutcomes)[number];
