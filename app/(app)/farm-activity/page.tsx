import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { timeDisplayFor } from "@/lib/time/member-display";
import { auditListLimit, listAuditEvents } from "@/lib/data/audit";
import { ActivityTable } from "../activity/_components/activity-table";

export const metadata: Metadata = { title: "Activity log" };

export default async function FarmActivityPage() {
  const member = await requirePage("audit:read-farm");
  const rows = await listAuditEvents(member, "farm");
  return (
    <>
      <PageHeader
        title="Activity log"
        lead={`What happened to ${member.farmName}'s records and people: uploads, corrections with old and new values, invitations, exports. Newest first; the latest ${auditListLimit} entries. Entries cannot be changed or deleted.`}
      />
      <ActivityTable
        rows={rows}
        caption={`${member.farmName} activity log`}
        csvFileName="farm-activity.csv"
        display={await timeDisplayFor(member)}
      />
    </>
  );
}
