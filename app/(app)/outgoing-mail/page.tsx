import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { listOutgoingMail } from "@/lib/data/mail";
import { mailKinds } from "@/lib/mail/queued-mail";
import { timeDisplayFor } from "@/lib/time/member-display";
import { OutgoingMailTable } from "./_components/outgoing-mail-table";

export const metadata: Metadata = { title: "Outgoing mail" };

const outcomeLabels = {
  queued: "Waiting to go",
  sent: "Sent",
  retrying: "Retrying",
  failed: "Failed",
  cancelled: "Not sent (link withdrawn)",
} as const;

// Rows keep the kind as sent; a kind no longer in the list shows as stored.
const kindLabels: Partial<Record<string, string>> = mailKinds;

export default async function OutgoingMailPage() {
  const member = await requirePage("mail:read-outgoing");
  const [records, display] = await Promise.all([listOutgoingMail(member), timeDisplayFor(member)]);
  return (
    <>
      <PageHeader
        title="Outgoing mail"
        lead="Every e-mail Rhizomorph has sent, newest first (the latest 200): to whom, what kind, and how it went. A message the mail server did not take is retried for about two hours before it counts as failed. What a message said is not kept here: invitation and password-reset links go to their addressee alone."
      />
      <OutgoingMailTable
        display={display}
        rows={records.map((record) => ({
          queuedAt: record.queuedAt.toISOString(),
          recipient: record.recipient,
          kind: kindLabels[record.kind] ?? record.kind,
          subject: record.subject,
          outcome: outcomeLabels[record.outcome],
          attempts: record.attempts,
          lastAttemptAt: record.lastAttemptAt?.toISOString() ?? "",
          problem: record.problem ?? "",
        }))}
      />
    </>
  );
}
