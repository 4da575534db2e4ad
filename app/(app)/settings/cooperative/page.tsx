import type { Metadata } from "next";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { getReleaseStatus } from "@/lib/data/pooled-releases";
import { getCooperativeSettingsForEditing } from "@/lib/data/pooled-settings";
import { getSeasonStart } from "@/lib/data/seasons";
import { getUploadRetentionDays } from "@/lib/data/upload-limits";
import { releaseHourIn } from "@/lib/pooled";
import { monthOptions, seasonLabel, seasonOfDate, seasonStartLabel } from "@/lib/seasons";
import { timeDisplayFor } from "@/lib/time/member-display";
import { ActionForm } from "@/components/forms/action-form";
import { CooperativeSettingsForm } from "./_components/cooperative-settings-form";
import { ReleasePanel } from "./_components/release-panel";
import { updateSeasonStartAction } from "./season-actions";
import { updateUploadRetentionAction } from "./upload-retention-actions";

export const metadata: Metadata = { title: "Co-op settings" };

export default async function CooperativeSettingsPage() {
  const member = await requirePage("settings:manage");
  const [{ name, ...settings }, releases, retentionDays, seasonStart, display] = await Promise.all([
    getCooperativeSettingsForEditing(member),
    getReleaseStatus(member),
    getUploadRetentionDays(member),
    getSeasonStart(member),
    timeDisplayFor(member),
  ]);
  const today = new Date().toISOString().slice(0, 10);
  return (
    <>
      <PageHeader title="Co-op settings" lead={`How ${name} publishes pooled results without exposing any one farm.`} />
      <div className="space-y-6">
        <Card>
          <CooperativeSettingsForm
            settings={{
              ...settings,
              releaseHour: releaseHourIn({ hour: settings.releaseHour, timeZone: settings.releaseTimeZone }, display.timeZone),
            }}
            timeZone={display.timeZone}
          />
        </Card>
        <Card title="Releases of the pooled figures">
          <ReleasePanel status={releases} display={display} />
        </Card>
        <Card title="Seasons">
          <p className="mb-3 max-w-xl text-sm">
            Blocks belong to the season in which they were inoculated, unless their season log names another. Seasons start on{" "}
            {seasonStartLabel(seasonStart)}: today is in season {seasonLabel(seasonOfDate(today, seasonStart), seasonStart)}. A block
            inoculated the day before the start belongs to the season before. Moving the start moves every block that follows its
            inoculation date.
          </p>
          <ActionForm
            action={updateSeasonStartAction}
            testId="season-start"
            submitLabel="Save"
            fields={[
              { name: "seasonStartMonth", label: "Seasons start in", options: monthOptions, defaultValue: String(seasonStart.month) },
              { name: "seasonStartDay", label: "on day", type: "number", defaultValue: String(seasonStart.day) },
            ]}
          />
        </Card>
        <Card title="Files of rejected uploads">
          <p className="mb-3 max-w-xl text-sm">
            A season log with errors is kept so its farm can see what was wrong and download what it sent. After this many days its file is
            removed; the record of the upload and its report stay.
          </p>
          <ActionForm
            action={updateUploadRetentionAction}
            testId="upload-retention"
            submitLabel="Save"
            fields={[
              {
                name: "rejectedUploadRetentionDays",
                label: "Keep the files of rejected uploads for (days)",
                type: "number",
                defaultValue: String(retentionDays),
              },
            ]}
          />
        </Card>
      </div>
    </>
  );
}
