import type { Metadata } from "next";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { getCooperativeSettingsForEditing } from "@/lib/data/pooled-settings";
import { CooperativeSettingsForm } from "./_components/cooperative-settings-form";

export const metadata: Metadata = { title: "Co-op settings" };

export default async function CooperativeSettingsPage() {
  const member = await requirePage("settings:manage");
  const settings = await getCooperativeSettingsForEditing(member);
  return (
    <>
      <PageHeader title="Co-op settings" lead={`How ${settings.name} publishes pooled results without exposing any one farm.`} />
      <Card>
        <CooperativeSettingsForm minimumFarms={settings.minimumFarms} showPerFarmEstimates={settings.showPerFarmEstimates} />
      </Card>
    </>
  );
}
