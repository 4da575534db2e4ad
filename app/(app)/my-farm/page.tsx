import type { Metadata } from "next";
import { Caution } from "@/components/ui/caution";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { MyFarmView } from "./_components/my-farm-view";

export const metadata: Metadata = { title: "My farm" };

export default async function MyFarmPage() {
  const member = await requirePage("farm-data:read");
  return (
    <>
      <PageHeader
        title="My farm"
        lead={`${member.farmName ?? "Your farm"}'s season: blocks, harvests and biological efficiency by strain, and where you sit in the co-op.`}
      />
      <div className="mb-6">
        <Caution which="pooledFigures" />
      </div>
      <MyFarmView />
    </>
  );
}
