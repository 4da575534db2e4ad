import type { Metadata } from "next";
import { ButtonLink } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { farmContextOf, requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/permissions";
import { listBlocks } from "@/lib/data/blocks";
import { BlocksTable } from "./_components/blocks-table";

export const metadata: Metadata = { title: "Blocks & harvests" };

export default async function BlocksPage() {
  const member = await requirePage("farm-data:read");
  const rows = await listBlocks(farmContextOf(member));
  return (
    <>
      <PageHeader
        title="Blocks & harvests"
        lead="Every block your farm has reported, with its flushes, biological efficiency (BE) and mass loss. Only your farm's people see these rows."
      >
        {can(member.role, "harvest:record") ? <ButtonLink href="/blocks/harvest">Record a harvest</ButtonLink> : null}
        {can(member.role, "season-log:upload") ? (
          <ButtonLink href="/season-logs" variant="secondary">
            Upload a season log
          </ButtonLink>
        ) : null}
      </PageHeader>
      <BlocksTable rows={rows} display={member.displayUnits} />
    </>
  );
}
