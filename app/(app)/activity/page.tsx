import type { Metadata } from "next";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { timeDisplayFor } from "@/lib/time/member-display";
import { auditListLimit, listAuditEvents } from "@/lib/data/audit";
import { ActivityTable } from "./_components/activity-table";

export const metadata: Metadata = { title: "Activity log" };

export default async function ActivityPage() {
  const member = await requirePage("audit:read-coop");
  const rows = await listAuditEvents(member, "coop");
  return (
    <>
      <PageHeader
        title="Activity log"
        lead={`Who did what at co-op level: sign-ins, farms admitted, invitations, role changes, registry changes, trial moves and withdrawals. Newest first; the latest ${auditListLimit} entries. Entries cannot be changed or deleted. A farm's own uploads and corrections are in that farm's log, not here.`}
      />
      <ActivityTable rows={rows} caption="Co-op activity log" csvFileName="coop-activity.csv" display={await timeDisplayFor(member)} />
    </>
  );
}
