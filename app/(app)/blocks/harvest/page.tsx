import type { Metadata } from "next";
import { Caution } from "@/components/ui/caution";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { listHarvestTargets } from "@/lib/data/blocks";
import { listRoomChoices } from "@/lib/data/rooms";
import { QuickHarvestForm } from "./quick-harvest-form";

export const metadata: Metadata = { title: "Record a harvest" };

export default async function RecordHarvestPage({ searchParams }: { searchParams: Promise<{ block?: string }> }) {
  const member = await requirePage("harvest:record");
  const [targets, rooms] = await Promise.all([listHarvestTargets(member), listRoomChoices(member)]);
  const { block } = await searchParams;
  return (
    <>
      <PageHeader title="Record a harvest" lead="One flush of one block, straight from the grow room." />
      <div className="max-w-md space-y-6">
        <QuickHarvestForm
          memberId={member.id}
          targets={targets}
          rooms={rooms}
          initialBlock={block ?? ""}
          defaultUnit={member.displayUnits === "imperial" ? "lb" : "g"}
        />
        <Caution which="spores" />
      </div>
    </>
  );
}
