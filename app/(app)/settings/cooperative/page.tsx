import type { Metadata } from "next";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { getReleaseStatus } from "@/lib/data/pooled-releases";
import { getCooperativeSettingsForEditing } from "@/lib/data/pooled-settings";
import { CooperativeSettingsForm } from "./_components/cooperative-settings-form";
import { ReleasePanel } from "./_components/release-panel";

export const metadata: Metadata = { title: "Co-op settings" };

export default async function CooperativeSettingsPage() {
  const member = await requirePage("settings:manage");
  const [{ name, ...settings }, releases] = await Promise.all([getCooperativeSettingsForEditing(member), getReleaseStatus(member)]);
  return (
    <>
      <PageHeader title="Co-op settings" lead={`How ${name} publishes pooled results without exposing any one farm.`} />
      <div className="space-y-6">
        <Card>
          <CooperativeSettingsForm settings={settings} />
        </Card>
        <Card title="Releases of the pooled figures">
          <ReleasePanel status={releases} />
        </Card>
      </div>
    </>
  );
}
